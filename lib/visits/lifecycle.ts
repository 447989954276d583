import type { VisitStatus } from "@/db/schema";

/**
 * A visit's life: scheduled → waiting (the client is in the waiting room) → in_progress (the therapist has joined)
 * → finished. Staff may cancel an open visit; one never started by its end (plus grace) becomes missed.
 */
const NEXT: Record<VisitStatus, readonly VisitStatus[]> = {
  scheduled: ["waiting", "in_progress", "cancelled", "missed"],
  waiting: ["in_progress", "cancelled", "missed"],
  in_progress: ["finished"],
  finished: [],
  cancelled: [],
  missed: [],
};

export function canMove(from: VisitStatus, to: VisitStatus): boolean {
  return from === to || NEXT[from].includes(to);
}

export const TERMINAL: readonly VisitStatus[] = ["finished", "cancelled", "missed"];

/** Joining opens 15 minutes before the start and closes 30 minutes after the planned end (common practice for clinics). */
export const JOIN_EARLY_MS = 15 * 60_000;
export const JOIN_LATE_MS = 30 * 60_000;

export function joinWindow(startsAt: Date, durationMin: number): { opens: Date; closes: Date } {
  return {
    opens: new Date(startsAt.getTime() - JOIN_EARLY_MS),
    closes: new Date(startsAt.getTime() + durationMin * 60_000 + JOIN_LATE_MS),
  };
}

/** Why a person cannot join now, or null when they can. */
export function joinRefusal(v: { status: VisitStatus; startsAt: Date; durationMin: number }, now: Date): string | null {
  if (v.status === "finished") return "This visit has ended.";
  if (v.status === "cancelled") return "This visit was cancelled.";
  if (v.status === "missed") return "This visit was missed; ask the clinic for a new time.";
  if (v.status === "in_progress") return null;
  const { opens, closes } = joinWindow(v.startsAt, v.durationMin);
  if (now < opens) return `The visit opens 15 minutes before it starts, at ${opens.toISOString().slice(11, 16)} UTC.`;
  if (now > closes) return "The time for this visit has passed.";
  return null;
}

/** The LiveKit room of a visit: derived from its id, never chosen by a caller. */
export function roomNameFor(visitId: string): string {
  return `visit-${visitId}`;
}
