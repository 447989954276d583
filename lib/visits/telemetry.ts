/**
 * What the client's browser sends the therapist during a video visit, compact enough for a steady 15 frames a second
 * (about 1.5 KB/s): one binary packet a tracked frame on LiveKit's lossy data channel, plus small JSON messages on the
 * reliable channel for the test in progress, the therapist's prompts and "keep this attempt".
 *
 * Frame packet, little-endian (version 2):
 *   u8 version | u8 flags (1 hand present, 2 plane verdict known, bits 2-3 the wrist's forearm line: 0 none or not a
 *   wrist motion, 1 pose, 2 straight-wrist reading, 3 capture start) | u16 sequence | u32 t (ms, sender's clock)
 *   i16 angle ×10 | i16 peak ×10 | u8 quality | u8 plane verdict | u8 repetitions | u8 rep phase | u8 score ×255
 *   u8 uncertainty (whole degrees, 255 = unknown) | u8 peak uncertainty (the same)
 *   | 21 × (u16 x, u16 y) image landmarks ×65535 when a hand is present
 * Version 1 packets (an older sender: no peak uncertainty byte) still decode, the peak taking the angle's uncertainty.
 */

import { FOREARM_SOURCES, type ForearmSource } from "@/vision/wrist-axis";

export const TELEMETRY_TOPIC = "kinarc.telemetry";
export const CONTROL_TOPIC = "kinarc.control";
export const TELEMETRY_VERSION = 2;
const HEADER_BYTES = 19;
const V1_HEADER_BYTES = 18;
const LANDMARKS = 21;

export const QUALITIES = ["ok", "no_hand", "low_score", "bad_landmarks", "degenerate"] as const;
export const PLANE_VERDICTS = ["unclear", "against_gravity", "gravity_assisted", "gravity_minimized"] as const;
export const REP_PHASES = ["rest", "moving", "hold", "returning"] as const;

export interface TelemetryFrame {
  seq: number;
  t: number;
  angleDeg: number | null;
  peakDeg: number | null;
  quality: (typeof QUALITIES)[number];
  plane: (typeof PLANE_VERDICTS)[number] | null;
  reps: number;
  repPhase: string;
  score: number;
  uncertaintyDeg: number | null;
  /** The peak's interval: a peak misses by more than a frame does (vision/pipeline.ts LiveUpdate.peakUncertaintyDeg). */
  peakUncertaintyDeg: number | null;
  /** Normalized image coordinates (0..1), as the tracker reports them, or null when no hand. */
  image: [number, number][] | null;
  /** Wrist motions: where this frame's forearm line came from (vision/wrist-axis.ts); null for finger motions. */
  forearmSource: ForearmSource | null;
}

const NO_ANGLE = -32768;
const clampInt = (v: number, lo: number, hi: number) => Math.max(lo, Math.min(hi, Math.round(v)));
const indexOr = (list: readonly string[], value: string | null, fallback: number) => {
  const i = value === null ? -1 : list.indexOf(value);
  return i < 0 ? fallback : i;
};

export function encodeTelemetry(f: TelemetryFrame): Uint8Array {
  const bytes = new Uint8Array(HEADER_BYTES + (f.image ? LANDMARKS * 4 : 0));
  const view = new DataView(bytes.buffer);
  view.setUint8(0, TELEMETRY_VERSION);
  // Older senders leave bits 2-3 clear, which reads as "no forearm line".
  const forearm = f.forearmSource ? FOREARM_SOURCES.indexOf(f.forearmSource) + 1 : 0;
  view.setUint8(1, (f.image ? 1 : 0) | (f.plane ? 2 : 0) | ((forearm & 3) << 2));
  view.setUint16(2, f.seq & 0xffff, true);
  view.setUint32(4, Math.max(0, Math.round(f.t)) >>> 0, true);
  view.setInt16(8, f.angleDeg === null ? NO_ANGLE : clampInt(f.angleDeg * 10, -32767, 32767), true);
  view.setInt16(10, f.peakDeg === null ? NO_ANGLE : clampInt(f.peakDeg * 10, -32767, 32767), true);
  view.setUint8(12, indexOr(QUALITIES, f.quality, 1));
  view.setUint8(13, indexOr(PLANE_VERDICTS, f.plane, 0));
  view.setUint8(14, clampInt(f.reps, 0, 255));
  view.setUint8(15, indexOr(REP_PHASES, f.repPhase, 0));
  view.setUint8(16, clampInt(f.score * 255, 0, 255));
  view.setUint8(17, f.uncertaintyDeg === null ? 255 : clampInt(f.uncertaintyDeg, 0, 254));
  view.setUint8(18, f.peakUncertaintyDeg === null ? 255 : clampInt(f.peakUncertaintyDeg, 0, 254));
  if (f.image) {
    if (f.image.length !== LANDMARKS) throw new Error(`telemetry: expected ${LANDMARKS} image landmarks, got ${f.image.length}`);
    f.image.forEach(([x, y], i) => {
      view.setUint16(HEADER_BYTES + i * 4, clampInt(x * 65535, 0, 65535), true);
      view.setUint16(HEADER_BYTES + i * 4 + 2, clampInt(y * 65535, 0, 65535), true);
    });
  }
  return bytes;
}

/** Decodes a frame packet; returns null for anything that is not one (wrong version or size), never throws. */
export function decodeTelemetry(bytes: Uint8Array): TelemetryFrame | null {
  if (bytes.byteLength < V1_HEADER_BYTES) return null;
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const version = view.getUint8(0);
  if (version !== TELEMETRY_VERSION && version !== 1) return null;
  const header = version === 1 ? V1_HEADER_BYTES : HEADER_BYTES;
  const flags = view.getUint8(1);
  const hasHand = (flags & 1) === 1;
  if (bytes.byteLength !== header + (hasHand ? LANDMARKS * 4 : 0)) return null;
  const angle = view.getInt16(8, true);
  const peak = view.getInt16(10, true);
  const uncertainty = view.getUint8(17);
  const peakUncertainty = version === 1 ? uncertainty : view.getUint8(18);
  let image: [number, number][] | null = null;
  if (hasHand) {
    image = [];
    for (let i = 0; i < LANDMARKS; i++) {
      image.push([view.getUint16(header + i * 4, true) / 65535, view.getUint16(header + i * 4 + 2, true) / 65535]);
    }
  }
  return {
    seq: view.getUint16(2, true),
    t: view.getUint32(4, true),
    angleDeg: angle === NO_ANGLE ? null : angle / 10,
    peakDeg: peak === NO_ANGLE ? null : peak / 10,
    quality: QUALITIES[view.getUint8(12)] ?? "no_hand",
    plane: flags & 2 ? (PLANE_VERDICTS[view.getUint8(13)] ?? null) : null,
    reps: view.getUint8(14),
    repPhase: REP_PHASES[view.getUint8(15)] ?? "rest",
    score: view.getUint8(16) / 255,
    uncertaintyDeg: uncertainty === 255 ? null : uncertainty,
    peakUncertaintyDeg: peakUncertainty === 255 ? null : peakUncertainty,
    image,
    forearmSource: FOREARM_SOURCES[((flags >> 2) & 3) - 1] ?? null,
  };
}

/** Reliable JSON messages between the two browsers of a visit. */
export type ControlMessage =
  | {
      type: "test";
      motion: string;
      side: "left" | "right";
      digit: string | null;
      condition: "against_gravity" | "gravity_minimized";
      /** The tested finger bends on its own, the others held straight. */
      oneFinger?: boolean;
      targetDeg: number | null;
    }
  | { type: "prompt"; motion: string; side: "left" | "right"; digit: string | null; condition: "against_gravity" | "gravity_minimized"; oneFinger?: boolean }
  | { type: "keep"; requestId: string }
  | { type: "kept"; requestId: string; captureUid: string; attemptId: string | null; queued: boolean }
  | { type: "clock"; sentAt: number }
  /** Therapist to client: take the straight-wrist reading now, for the wrist test in progress. */
  | { type: "neutral-ask"; requestId: string }
  /** Client to therapist: how the straight-wrist reading went (sent when it starts, and when it is taken or refused). */
  | { type: "neutral"; requestId: string | null; status: NeutralStatus; motion: string; side: "left" | "right"; problem: string | null; view: string | null; spreadDeg: number | null };

export const NEUTRAL_STATUSES = ["holding", "taken", "refused"] as const;
export type NeutralStatus = (typeof NEUTRAL_STATUSES)[number];

export function encodeControl(message: ControlMessage): Uint8Array {
  return new TextEncoder().encode(JSON.stringify(message));
}

export function decodeControl(bytes: Uint8Array): ControlMessage | null {
  try {
    const value = JSON.parse(new TextDecoder().decode(bytes)) as ControlMessage;
    return value && typeof value === "object" && typeof value.type === "string" ? value : null;
  } catch {
    return null;
  }
}

/**
 * Holds telemetry back by the video's measured delay so the overlay is drawn on the picture it belongs to: frames
 * are stamped with the sender's clock; the receiver learns the offset between clocks from the smallest observed
 * (arrival − stamp) and releases each frame when its stamp + offset + video delay has passed.
 */
export class TelemetryAligner {
  private queue: { frame: TelemetryFrame; due: number }[] = [];
  private offset = Number.POSITIVE_INFINITY;

  constructor(private videoDelayMs = 0) {}

  setVideoDelay(ms: number) {
    this.videoDelayMs = Math.max(0, ms);
  }

  push(frame: TelemetryFrame, arrivalMs: number) {
    this.offset = Math.min(this.offset, arrivalMs - frame.t);
    this.queue.push({ frame, due: frame.t + this.offset + this.videoDelayMs });
  }

  /** The newest frame that is due at `nowMs`, dropping older ones; null when none is due yet. */
  take(nowMs: number): TelemetryFrame | null {
    let latest: TelemetryFrame | null = null;
    while (this.queue.length && this.queue[0].due <= nowMs) latest = this.queue.shift()!.frame;
    return latest;
  }
}
