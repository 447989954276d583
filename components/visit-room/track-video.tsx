"use client";

import type { Track } from "livekit-client";
import { forwardRef, useEffect, useImperativeHandle, useRef } from "react";

/** Attaches a LiveKit track to a <video> (or <audio>) element for as long as both exist. */
export const TrackVideo = forwardRef<
  HTMLVideoElement,
  { track: Track | null; mirrored?: boolean; className?: string; label: string; muted?: boolean; onSize?: (width: number, height: number) => void }
>(function TrackVideo({ track, mirrored = false, className = "", label, muted = false, onSize }, ref) {
  const el = useRef<HTMLVideoElement>(null);
  useImperativeHandle(ref, () => el.current!, []);
  useEffect(() => {
    const node = el.current;
    if (!track || !node) return;
    track.attach(node);
    return () => {
      track.detach(node);
    };
  }, [track]);
  return (
    <video
      ref={el}
      aria-label={label}
      autoPlay
      playsInline
      muted={muted}
      onResize={(e) => onSize?.(e.currentTarget.videoWidth, e.currentTarget.videoHeight)}
      className={`${mirrored ? "-scale-x-100" : ""} ${className}`}
    />
  );
});

export function TrackAudio({ track }: { track: Track | null }) {
  const el = useRef<HTMLAudioElement>(null);
  useEffect(() => {
    const node = el.current;
    if (!track || !node) return;
    track.attach(node);
    return () => {
      track.detach(node);
    };
  }, [track]);
  return <audio ref={el} autoPlay />;
}
