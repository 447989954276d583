/**
 * Which motions a client may check on their own. Until the therapist assigns a home programme (a later issue), the
 * offer is every motion of the catalog on the affected side(s), less those a precaution on the client's record rules
 * out without a therapist watching. Pure.
 */
import type { PrecautionFlag } from "@/db/schema";
import { MOTION_IDS, MOTIONS, type MotionId, type Side } from "@/lib/motions/catalog";

export interface WithheldMotion {
  motion: MotionId;
  reason: string;
}

export interface SelfCheckPlan {
  sides: Side[];
  offered: MotionId[];
  withheld: WithheldMotion[];
}

const SIDEWAYS: readonly MotionId[] = ["wrist.radial_deviation", "wrist.ulnar_deviation", "finger.abduction", "finger.adduction"];

/**
 * Motions each precaution keeps out of an unsupervised check, and why, in the client's words. Reasoning, not a
 * protocol: after a tendon repair the surgeon's protocol decides which finger movements are safe and when, so these
 * are left to a supervised visit [common practice: early active motion after flexor tendon repair is therapist-led];
 * a repaired ligament or capsule, or an unstable joint, is not stressed sideways [common practice]. Other flags
 * (fracture, osteoporosis, swelling) limit resistance, which a self-check never uses, and are covered by the safety note.
 */
const RULES: Partial<Record<PrecautionFlag, { blocks: (m: MotionId) => boolean; reason: string }>> = {
  tendon_repair: {
    blocks: (m) => MOTIONS[m].joint !== "wrist",
    reason: "After a tendon repair, your surgeon's protocol decides which finger movements are safe. Your therapist will check these with you in a visit.",
  },
  ligament_or_capsule_repair: {
    blocks: (m) => SIDEWAYS.includes(m),
    reason: "Side-to-side movements can strain a repaired ligament. Your therapist will check these with you in a visit.",
  },
  joint_instability: {
    blocks: (m) => SIDEWAYS.includes(m),
    reason: "Side-to-side movements can strain an unstable joint. Your therapist will check these with you in a visit.",
  },
};

export function selfCheckPlan(client: { affectedSide: "left" | "right" | "both"; precautionFlags: readonly PrecautionFlag[] }): SelfCheckPlan {
  const sides: Side[] = client.affectedSide === "both" ? ["left", "right"] : [client.affectedSide];
  const offered: MotionId[] = [];
  const withheld: WithheldMotion[] = [];
  for (const motion of MOTION_IDS) {
    const rule = client.precautionFlags.map((f) => RULES[f]).find((r) => r?.blocks(motion));
    if (rule) withheld.push({ motion, reason: rule.reason });
    else offered.push(motion);
  }
  return { sides, offered, withheld };
}

const FINGER_FLEXION: readonly MotionId[] = ["mcp.flexion", "pip.flexion", "dip.flexion"];

/**
 * For finger flexion the client bends all four fingers together while the camera reads the chosen one: on held-out
 * renders a finger bent on its own next to straight ones reads 19-32 degrees off at every joint, while four fingers
 * together read 3.8 (MCP) and 5.1 (PIP) degrees off from the little-finger side (scripts/accuracy/report.md, the
 * acceptance list and its one-finger comparison). Null for other motions and for the thumb.
 */
export function fingersTogetherNote(motion: MotionId, digit: string | null): string | null {
  if (!FINGER_FLEXION.includes(motion) || !digit || digit === "thumb") return null;
  return `Bend all four fingers together, even though the check is for your ${digit} finger: the camera reads a finger far better when its neighbours move with it.`;
}

/**
 * The client's words when the therapist asks for one finger on its own (a visit's test with `oneFinger`): the other
 * fingers stay straight, held down with the other hand if need be [common practice for isolating one finger's flexor].
 */
export function oneFingerNote(digit: string | null): string | null {
  if (!digit || digit === "thumb") return null;
  return `Bend only your ${digit} finger. Keep the other fingers straight; you may hold them flat with your other hand.`;
}
