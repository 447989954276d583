"use client";

import type { Track } from "livekit-client";
import { forwardRef, useEffect, useImperativeHandle, useRef } from "react";

/** A ref for a media element that has `track` attached for as long as both exist (detached on change and unmount). */
function useAttachedTrack<E extends HTMLMediaElement>(track: Track | null) {
  const el = useRef<E>(null);
  useEffect(() => {
    const node = el.current;
    if (!track || !node) return;
    track.attach(node);
    return () => {
      track.detach(node);
    };
  }, [track]);
  return el;
}

/** Shows a LiveKit video track in a <video> element. */
export const TrackVideo = forwardRef<
  HTMLVideoElement,
  { track: Track | null; mirrored?: boolean; className?: string; label: string; muted?: boolean; onSize?: (width: number, height: number) => void }
>(function TrackVideo({ track, mirrored = false, className = "", label, muted = false, onSize }, ref) {
  const el = useAttachedTrack<HTMLVideoElement>(track);
  // `el` is the same ref object on every render, so this still runs once, as before.
  useImperativeHandle(ref, () => el.current!, [el]);
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
  const el = useAttachedTrack<HTMLAudioElement>(track);
  return <audio ref={el} autoPlay />;
}
