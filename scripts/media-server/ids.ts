import { randomBytes } from "node:crypto";

// livekit-client tells participant and track ids apart by their "PA_" / "TR_" prefixes (extractTrackSid),
// and splits remote stream ids "PA_…|TR_…" on "|", so ids are hex after the prefix.
export type SidPrefix = "RM" | "PA" | "TR";

export function newSid(prefix: SidPrefix): string {
  return `${prefix}_${randomBytes(6).toString("hex")}`;
}
