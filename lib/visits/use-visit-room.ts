"use client";

import { ConnectionState, Room, RoomEvent, Track, type LocalVideoTrack, type RemoteParticipant, type RemoteTrack } from "livekit-client";
import { useCallback, useEffect, useRef, useState } from "react";
import { CONTROL_TOPIC, decodeControl, decodeTelemetry, encodeControl, TELEMETRY_TOPIC, type ControlMessage, type TelemetryFrame } from "./telemetry";

export interface VisitRoomHandlers {
  onTelemetry?: (frame: TelemetryFrame, arrivalMs: number) => void;
  onControl?: (message: ControlMessage, from: string) => void;
}

export interface VisitRoomState {
  phase: "idle" | "connecting" | "connected" | "reconnecting" | "left" | "failed";
  error: string | null;
  remote: RemoteParticipant | null;
  remoteVideo: RemoteTrack | null;
  remoteAudio: RemoteTrack | null;
  localVideo: LocalVideoTrack | null;
}

/**
 * One visit's LiveKit room: asks Kinarc for a short-lived token (the server decides the room and identity), connects,
 * publishes camera and microphone, and passes data messages to the page. Options suit both a real LiveKit server and
 * the local stand-in (no simulcast, no adaptive stream, separate publish and subscribe connections).
 */
export function useVisitRoom(visitId: string, handlers: VisitRoomHandlers) {
  const [state, setState] = useState<VisitRoomState>({ phase: "idle", error: null, remote: null, remoteVideo: null, remoteAudio: null, localVideo: null });
  const roomRef = useRef<Room | null>(null);
  const handlersRef = useRef(handlers);
  useEffect(() => {
    handlersRef.current = handlers;
  });

  const refreshRemote = useCallback((room: Room) => {
    const remote = [...room.remoteParticipants.values()][0] ?? null;
    const pubs = remote ? [...remote.trackPublications.values()] : [];
    setState((s) => ({
      ...s,
      remote,
      remoteVideo: pubs.find((p) => p.kind === Track.Kind.Video && p.track)?.track ?? null,
      remoteAudio: pubs.find((p) => p.kind === Track.Kind.Audio && p.track)?.track ?? null,
    }));
  }, []);

  const join = useCallback(
    async (devices: { videoDeviceId?: string; audioDeviceId?: string; videoTrack?: MediaStreamTrack } = {}) => {
      setState((s) => ({ ...s, phase: "connecting", error: null }));
      try {
        const res = await fetch(`/api/v1/visits/${visitId}/token`, { method: "POST" });
        const body = await res.json();
        if (!res.ok) throw new Error(body.error ?? `Could not join (${res.status})`);
        const room = new Room({ adaptiveStream: false, dynacast: false, singlePeerConnection: false, publishDefaults: { simulcast: false } });
        roomRef.current = room;
        room
          .on(RoomEvent.ParticipantConnected, () => refreshRemote(room))
          .on(RoomEvent.ParticipantDisconnected, () => refreshRemote(room))
          .on(RoomEvent.TrackSubscribed, () => refreshRemote(room))
          .on(RoomEvent.TrackUnsubscribed, () => refreshRemote(room))
          .on(RoomEvent.Reconnecting, () => setState((s) => ({ ...s, phase: "reconnecting" })))
          .on(RoomEvent.Reconnected, () => {
            setState((s) => ({ ...s, phase: "connected" }));
            refreshRemote(room);
          })
          .on(RoomEvent.Disconnected, () => setState((s) => ({ ...s, phase: s.phase === "left" ? "left" : "failed", error: s.phase === "left" ? null : "The connection was lost." })))
          .on(RoomEvent.DataReceived, (payload, participant, _kind, topic) => {
            const from = participant?.identity ?? "";
            if (topic === TELEMETRY_TOPIC) {
              const frame = decodeTelemetry(payload);
              if (frame) handlersRef.current.onTelemetry?.(frame, performance.now());
            } else if (topic === CONTROL_TOPIC) {
              const message = decodeControl(payload);
              if (message) handlersRef.current.onControl?.(message, from);
            }
          });
        await room.connect(body.url, body.token);
        await room.localParticipant.setMicrophoneEnabled(true, devices.audioDeviceId ? { deviceId: devices.audioDeviceId } : undefined);
        // The client's browser already runs the camera for hand tracking: publish that same track, not a second one.
        if (devices.videoTrack) await room.localParticipant.publishTrack(devices.videoTrack, { source: Track.Source.Camera, simulcast: false });
        else await room.localParticipant.setCameraEnabled(true, devices.videoDeviceId ? { deviceId: devices.videoDeviceId } : undefined);
        const cam = room.localParticipant.getTrackPublication(Track.Source.Camera)?.videoTrack ?? null;
        setState((s) => ({ ...s, phase: "connected", localVideo: cam }));
        refreshRemote(room);
      } catch (error) {
        setState((s) => ({ ...s, phase: "failed", error: error instanceof Error ? error.message : String(error) }));
      }
    },
    [visitId, refreshRemote],
  );

  const leave = useCallback(async () => {
    setState((s) => ({ ...s, phase: "left" }));
    await roomRef.current?.disconnect();
    roomRef.current = null;
  }, []);

  const sendTelemetry = useCallback((bytes: Uint8Array) => {
    const room = roomRef.current;
    if (room?.state !== ConnectionState.Connected) return;
    void room.localParticipant.publishData(bytes as Uint8Array<ArrayBuffer>, { reliable: false, topic: TELEMETRY_TOPIC }).catch(() => undefined);
  }, []);

  const sendControl = useCallback(async (message: ControlMessage) => {
    const room = roomRef.current;
    if (room?.state !== ConnectionState.Connected) throw new Error("Not connected to the visit.");
    await room.localParticipant.publishData(encodeControl(message) as Uint8Array<ArrayBuffer>, { reliable: true, topic: CONTROL_TOPIC });
  }, []);

  useEffect(() => () => void roomRef.current?.disconnect(), []);

  return { state, join, leave, sendTelemetry, sendControl, room: roomRef };
}
