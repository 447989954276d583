import { describe, expect, it } from "vitest";
import { decodeControl, decodeTelemetry, encodeControl, encodeTelemetry, TelemetryAligner, type TelemetryFrame } from "./telemetry";

function frame(over: Partial<TelemetryFrame> = {}): TelemetryFrame {
  return {
    seq: 7,
    t: 123_456,
    angleDeg: 62.3,
    peakDeg: 71.9,
    quality: "ok",
    plane: "against_gravity",
    reps: 2,
    repPhase: "hold",
    score: 0.93,
    uncertaintyDeg: 6,
    peakUncertaintyDeg: 11,
    image: Array.from({ length: 21 }, (_, i) => [i / 21, 1 - i / 42] as [number, number]),
    forearmSource: null,
    ...over,
  };
}

describe("telemetry packets", () => {
  it("round-trip within the stated quantization (0.1°, 1/65535 of the image)", () => {
    const original = frame();
    const bytes = encodeTelemetry(original);
    expect(bytes.byteLength).toBe(19 + 21 * 4);
    const back = decodeTelemetry(bytes)!;
    expect(back.angleDeg).toBeCloseTo(62.3, 5);
    expect(back.peakDeg).toBeCloseTo(71.9, 5);
    expect(back).toMatchObject({ seq: 7, t: 123_456, quality: "ok", plane: "against_gravity", reps: 2, repPhase: "hold", uncertaintyDeg: 6, peakUncertaintyDeg: 11 });
    expect(back.score).toBeCloseTo(0.93, 2);
    back.image!.forEach(([x, y], i) => {
      expect(Math.abs(x - original.image![i][0])).toBeLessThanOrEqual(1 / 65535);
      expect(Math.abs(y - original.image![i][1])).toBeLessThanOrEqual(1 / 65535);
    });
  });

  it("carries 'no angle' and 'no hand' explicitly rather than as zeros", () => {
    const back = decodeTelemetry(encodeTelemetry(frame({ angleDeg: null, peakDeg: null, image: null, plane: null, quality: "no_hand", uncertaintyDeg: null, peakUncertaintyDeg: null })))!;
    expect(back).toMatchObject({ angleDeg: null, peakDeg: null, image: null, plane: null, quality: "no_hand", uncertaintyDeg: null, peakUncertaintyDeg: null });
  });

  it("still reads a version 1 packet from an older sender, its peak taking the angle's interval", () => {
    // Version 1 is version 2 without the peak-uncertainty byte (offset 18).
    for (const image of [frame().image, null]) {
      const v2 = encodeTelemetry(frame({ image }));
      const v1 = new Uint8Array(v2.byteLength - 1);
      v1.set(v2.subarray(0, 18));
      v1.set(v2.subarray(19), 18);
      v1[0] = 1;
      const back = decodeTelemetry(v1)!;
      expect(back).toMatchObject({ seq: 7, angleDeg: 62.3, uncertaintyDeg: 6, peakUncertaintyDeg: 6 });
      expect(back.image?.[20][0] ?? null).toBe(image ? decodeTelemetry(v2)!.image![20][0] : null);
      // A version 1 packet of version 2's length is refused.
      const wrong = v2.slice();
      wrong[0] = 1;
      expect(decodeTelemetry(wrong)).toBeNull();
    }
  });

  it("keeps hyperextension (negative angles)", () => {
    expect(decodeTelemetry(encodeTelemetry(frame({ angleDeg: -12.4 })))!.angleDeg).toBeCloseTo(-12.4, 5);
  });

  it("at 15 frames a second stays under the 4 KB/s budget", () => {
    expect(encodeTelemetry(frame()).byteLength * 15).toBeLessThan(4096);
  });

  it("rejects packets of another version or a wrong length", () => {
    const bytes = encodeTelemetry(frame());
    expect(decodeTelemetry(bytes.slice(0, 40))).toBeNull();
    const other = bytes.slice();
    other[0] = 9;
    expect(decodeTelemetry(other)).toBeNull();
  });

  it("carries the wrist's forearm line in the flags without growing the packet, and not the other flags' bits", () => {
    for (const forearmSource of ["pose", "neutral-reading", "capture-start", null] as const) {
      for (const image of [frame().image, null]) {
        const bytes = encodeTelemetry(frame({ forearmSource, image, plane: null }));
        expect(bytes.byteLength).toBe(19 + (image ? 21 * 4 : 0));
        expect(decodeTelemetry(bytes)).toMatchObject({ forearmSource, plane: null, image: image ? expect.any(Array) : null });
      }
    }
    // A packet from a sender that predates the field (bits 2-3 clear) reads as "no forearm line", not as a source.
    const old = encodeTelemetry(frame({ forearmSource: "neutral-reading" }));
    old[1] &= 0b11;
    expect(decodeTelemetry(old)).toMatchObject({ forearmSource: null, plane: "against_gravity" });
  });

  it("straight-wrist reading messages round-trip", () => {
    const ask = { type: "neutral-ask", requestId: "r1" } as const;
    const told = { type: "neutral", requestId: "r1", status: "refused", motion: "wrist.extension", side: "left", problem: "the hand moved 12 degrees", view: null, spreadDeg: 12 } as const;
    expect(decodeControl(encodeControl(ask))).toEqual(ask);
    expect(decodeControl(encodeControl(told))).toEqual(told);
  });

  it("control messages round-trip and garbage is ignored", () => {
    const m = { type: "prompt", motion: "pip.flexion", side: "right", digit: "index", condition: "gravity_minimized" } as const;
    expect(decodeControl(encodeControl(m))).toEqual(m);
    expect(decodeControl(new TextEncoder().encode("{nope"))).toBeNull();
  });
});

describe("TelemetryAligner", () => {
  it("releases frames after the video delay, relative to the sender's clock", () => {
    const a = new TelemetryAligner(200);
    // Sender clock runs 10 000 ms behind the receiver's; network takes 30 ms.
    a.push(frame({ t: 1000, seq: 1 }), 11_030);
    a.push(frame({ t: 1066, seq: 2 }), 11_096);
    expect(a.take(11_100)).toBeNull();
    expect(a.take(11_230)?.seq).toBe(1);
    expect(a.take(11_300)?.seq).toBe(2);
    expect(a.take(11_400)).toBeNull();
  });
});
