// The one table of wrist and finger motions Kinarc measures. Pure data plus small look-ups, so the browser, a Web Worker,
// route handlers and the CLI all read the same values. Normal end-ranges carry their source beside every number:
// Norkin & White, Measurement of Joint Motion, 5th ed. (2016), Appendix A for the wrist tables; AAOS (1965) Joint
// Motion: Method of Measuring and Recording for fingers and thumb (cited through secondary sources, see
// shared/notes/clinical-references.md); Ryu et al. 1991 and Hume et al. 1990 for functional ranges.

export const DIGITS = ["thumb", "index", "middle", "ring", "little"] as const;
export type Digit = (typeof DIGITS)[number];
export const FINGERS = ["index", "middle", "ring", "little"] as const satisfies readonly Digit[];

export const SIDES = ["left", "right"] as const;
export type Side = (typeof SIDES)[number];

export const CONDITIONS = ["against_gravity", "gravity_minimized"] as const;
export type Condition = (typeof CONDITIONS)[number];

export const MOTION_IDS = [
  "wrist.flexion",
  "wrist.extension",
  "wrist.radial_deviation",
  "wrist.ulnar_deviation",
  "mcp.flexion",
  "mcp.extension",
  "pip.flexion",
  "dip.flexion",
  "ip.flexion",
  "ip.extension",
  "finger.abduction",
  "finger.adduction",
] as const;
export type MotionId = (typeof MOTION_IDS)[number];

export type Joint = "wrist" | "mcp" | "pip" | "dip" | "ip";
export type CameraView = "side" | "overhead" | "front";

/**
 * What the grade compares with the reference: `peak` = the angle reached from anatomical zero;
 * `arc` = the angle travelled in the capture. Return motions (extension of the finger joints back to straight,
 * adduction back to the midline) end at or near anatomical zero, so only their arc says how much work was done.
 */
export type GradedMeasure = "peak" | "arc";

export const RANGE_TABLE_IDS = ["aaos1965", "ama", "boone_azen_1979", "greene_wolf", "walker_65_85", "functional"] as const;
export type RangeTableId = (typeof RANGE_TABLE_IDS)[number];
export const DEFAULT_RANGE_TABLE: RangeTableId = "aaos1965";

export const RANGE_TABLES: Record<RangeTableId, { label: string; citation: string }> = {
  aaos1965: { label: "AAOS 1965", citation: "American Academy of Orthopaedic Surgeons, Joint Motion: Method of Measuring and Recording, 1965" },
  ama: { label: "AMA Guides", citation: "AMA Guides to the Evaluation of Permanent Impairment, as tabulated in Norkin & White, 5th ed., 2016, Appendix A" },
  boone_azen_1979: { label: "Boone & Azen 1979", citation: "Boone & Azen, J Bone Joint Surg Am 1979, as tabulated in Norkin & White, 5th ed., 2016, Appendix A" },
  greene_wolf: { label: "Greene & Wolf", citation: "Greene & Wolf, as tabulated in Norkin & White, 5th ed., 2016, Appendix A" },
  walker_65_85: { label: "Walker et al. (ages 65-85)", citation: "Walker et al., older adults 65-85 y, as tabulated in Norkin & White, 5th ed., 2016, Appendix A" },
  functional: { label: "Functional range", citation: "Ryu et al., J Hand Surg Am 1991;16:409 (wrist); Hume et al., J Hand Surg Am 1990;15:240 (fingers)" },
};

/** A normal value always travels with the words that say where it comes from. */
export interface SourcedDeg {
  deg: number;
  source: string;
}

/** `wrist` keys values of wrist motions, which apply to no digit. */
export type RangeKey = Digit | "wrist";
type TableValues = Partial<Record<RangeTableId, Partial<Record<RangeKey, SourcedDeg>>>>;

export interface MotionDefinition {
  id: MotionId;
  label: string;
  joint: Joint;
  /** The digits this motion applies to; empty for the wrist. */
  digits: readonly Digit[];
  /** Which way a positive reported angle goes, from anatomical zero. */
  signConvention: string;
  gradedOn: GradedMeasure;
  normalEndRange: TableValues;
  primeMovers: readonly string[];
  cameraView: CameraView;
  testPosition: Record<Condition, string>;
}

const NW = "Norkin & White, Measurement of Joint Motion, 5th ed., 2016, Appendix A";
const AAOS = "AAOS 1965, Joint Motion: Method of Measuring and Recording (secondary source, [from memory] until checked)";

function wristRow(aaos: number, ama: number, boone: number, greene: number, walker: number, functional: number, fnSource: string): TableValues {
  return {
    aaos1965: { wrist: { deg: aaos, source: `AAOS 1965 via ${NW}` } },
    ama: { wrist: { deg: ama, source: `AMA Guides via ${NW}` } },
    boone_azen_1979: { wrist: { deg: boone, source: `Boone & Azen 1979 via ${NW}` } },
    greene_wolf: { wrist: { deg: greene, source: `Greene & Wolf via ${NW}` } },
    walker_65_85: { wrist: { deg: walker, source: `Walker et al. (65-85 y) via ${NW}` } },
    functional: { wrist: { deg: functional, source: fnSource } },
  };
}

function perDigit(digits: readonly Digit[], deg: number, source: string): Partial<Record<RangeKey, SourcedDeg>> {
  return Object.fromEntries(digits.map((d) => [d, { deg, source }]));
}

const RYU = "Ryu et al., J Hand Surg Am 1991;16:409 (functional range)";
const HUME = "Hume et al., J Hand Surg Am 1990;15:240 (functional range)";

export const MOTIONS: Record<MotionId, MotionDefinition> = {
  "wrist.flexion": {
    id: "wrist.flexion",
    label: "Wrist flexion",
    joint: "wrist",
    digits: [],
    signConvention: "positive as the palm moves toward the front of the forearm",
    gradedOn: "peak",
    normalEndRange: wristRow(80, 60, 76, 73, 64, 54, RYU),
    primeMovers: ["flexor carpi radialis", "flexor carpi ulnaris", "palmaris longus (assists)"],
    cameraView: "side",
    testPosition: {
      against_gravity: "Forearm resting on the table palm up, hand past the edge; the client curls the hand up toward the ceiling.",
      gravity_minimized: "Forearm resting on its little-finger edge with the thumb on top; the hand slides toward the palm side along the table.",
    },
  },
  "wrist.extension": {
    id: "wrist.extension",
    label: "Wrist extension",
    joint: "wrist",
    digits: [],
    signConvention: "positive as the back of the hand moves toward the back of the forearm",
    gradedOn: "peak",
    normalEndRange: wristRow(70, 60, 75, 65, 63, 60, RYU),
    primeMovers: ["extensor carpi radialis longus", "extensor carpi radialis brevis", "extensor carpi ulnaris"],
    cameraView: "side",
    testPosition: {
      against_gravity: "Forearm resting on the table palm down, hand past the edge; the client lifts the back of the hand toward the ceiling.",
      gravity_minimized: "Forearm resting on its little-finger edge with the thumb on top; the hand slides toward the back-of-hand side along the table.",
    },
  },
  "wrist.radial_deviation": {
    id: "wrist.radial_deviation",
    label: "Wrist radial deviation",
    joint: "wrist",
    digits: [],
    signConvention: "positive as the hand tilts toward the thumb side in the plane of the palm",
    gradedOn: "peak",
    normalEndRange: wristRow(20, 20, 22, 25, 19, 17, RYU),
    primeMovers: ["extensor carpi radialis longus", "extensor carpi radialis brevis", "flexor carpi radialis"],
    cameraView: "overhead",
    testPosition: {
      against_gravity: "Forearm on its little-finger edge with the hand past the table edge; the client lifts the thumb side of the hand upward.",
      gravity_minimized: "Forearm and palm flat on the table; the hand slides toward the thumb side without lifting.",
    },
  },
  "wrist.ulnar_deviation": {
    id: "wrist.ulnar_deviation",
    label: "Wrist ulnar deviation",
    joint: "wrist",
    digits: [],
    signConvention: "positive as the hand tilts toward the little-finger side in the plane of the palm",
    gradedOn: "peak",
    normalEndRange: wristRow(30, 30, 36, 39, 26, 40, RYU),
    primeMovers: ["flexor carpi ulnaris", "extensor carpi ulnaris"],
    cameraView: "overhead",
    testPosition: {
      against_gravity: "Forearm on its thumb edge (thumb down) with the hand past the table edge; the client lifts the little-finger side upward.",
      gravity_minimized: "Forearm and palm flat on the table; the hand slides toward the little-finger side without lifting.",
    },
  },
  "mcp.flexion": {
    id: "mcp.flexion",
    label: "MCP flexion",
    joint: "mcp",
    digits: DIGITS,
    signConvention: "positive as the finger bends at the knuckle toward the palm; negative is hyperextension",
    gradedOn: "peak",
    normalEndRange: {
      aaos1965: { ...perDigit(FINGERS, 90, AAOS), thumb: { deg: 50, source: AAOS } },
      functional: perDigit(FINGERS, 61, HUME),
    },
    primeMovers: ["lumbricals", "dorsal and palmar interossei", "flexor digitorum superficialis and profundus (assist)"],
    cameraView: "side",
    testPosition: {
      against_gravity: "Back of the hand resting on the table, fingers straight; the client bends at the knuckles, lifting the straight fingers up.",
      gravity_minimized: "Hand resting on its little-finger edge; the fingers bend at the knuckles sliding along the table.",
    },
  },
  "mcp.extension": {
    id: "mcp.extension",
    label: "MCP extension",
    joint: "mcp",
    digits: FINGERS,
    signConvention: "positive as the finger lifts at the knuckle past straight, away from the palm",
    gradedOn: "peak",
    normalEndRange: { aaos1965: perDigit(FINGERS, 45, `${AAOS}: MCP hyperextension`) },
    primeMovers: ["extensor digitorum", "extensor indicis (index)", "extensor digiti minimi (little)"],
    cameraView: "side",
    testPosition: {
      against_gravity: "Palm resting on the table with the knuckles at the edge; the client lifts the fingers upward from the knuckles.",
      gravity_minimized: "Hand resting on its little-finger edge; the fingers straighten and pass straight at the knuckles along the table.",
    },
  },
  "pip.flexion": {
    id: "pip.flexion",
    label: "PIP flexion",
    joint: "pip",
    digits: FINGERS,
    signConvention: "positive as the middle joint bends toward the palm",
    gradedOn: "peak",
    normalEndRange: { aaos1965: perDigit(FINGERS, 100, AAOS), functional: perDigit(FINGERS, 60, HUME) },
    primeMovers: ["flexor digitorum superficialis"],
    cameraView: "side",
    testPosition: {
      against_gravity: "Back of the hand on the table with the knuckle held straight; the client bends the middle joint, lifting the fingertip.",
      gravity_minimized: "Hand on its little-finger edge, knuckle held straight; the middle joint bends with the finger sliding along the table.",
    },
  },
  "dip.flexion": {
    id: "dip.flexion",
    label: "DIP flexion",
    joint: "dip",
    digits: FINGERS,
    signConvention: "positive as the end joint bends toward the palm",
    gradedOn: "peak",
    normalEndRange: { aaos1965: perDigit(FINGERS, 90, AAOS), functional: perDigit(FINGERS, 39, HUME) },
    primeMovers: ["flexor digitorum profundus"],
    cameraView: "side",
    testPosition: {
      against_gravity: "Back of the hand on the table, middle joint steadied straight; the client bends only the end joint, lifting the tip.",
      gravity_minimized: "Hand on its little-finger edge, middle joint steadied; the end joint bends with the tip sliding along the table.",
    },
  },
  "ip.flexion": {
    id: "ip.flexion",
    label: "Thumb IP flexion",
    joint: "ip",
    digits: ["thumb"],
    signConvention: "positive as the thumb's end joint bends toward the palm",
    gradedOn: "peak",
    normalEndRange: { aaos1965: { thumb: { deg: 80, source: AAOS } } },
    primeMovers: ["flexor pollicis longus"],
    cameraView: "side",
    testPosition: {
      against_gravity: "Hand resting on its back with the thumb's first joint steadied; the client bends the thumb tip upward.",
      gravity_minimized: "Palm flat on the table; the thumb tip bends while the thumb slides along the table surface.",
    },
  },
  "ip.extension": {
    id: "ip.extension",
    label: "IP extension",
    joint: "ip",
    digits: DIGITS,
    signConvention: "positive as a bent finger's middle joint (the thumb's end joint) straightens; graded on the arc back toward straight",
    gradedOn: "arc",
    normalEndRange: {
      aaos1965: {
        ...perDigit(FINGERS, 100, `${AAOS}: PIP flexion 100, the arc from full flexion back to straight`),
        thumb: { deg: 80, source: `${AAOS}: thumb IP flexion 80, the arc from full flexion back to straight` },
      },
    },
    primeMovers: ["lumbricals", "interossei (through the extensor mechanism)", "extensor digitorum", "extensor pollicis longus (thumb)"],
    cameraView: "side",
    testPosition: {
      against_gravity: "Palm resting on the table, fingers bent over the edge; the client straightens the bent joint, lifting the tip toward the ceiling.",
      gravity_minimized: "Hand on its little-finger edge, fingers bent; the bent joint straightens with the finger sliding along the table.",
    },
  },
  "finger.abduction": {
    id: "finger.abduction",
    label: "Finger abduction",
    joint: "mcp",
    digits: FINGERS,
    signConvention: "positive as the finger spreads away from the middle finger's line in the plane of the palm (middle finger: either way)",
    gradedOn: "peak",
    normalEndRange: { aaos1965: perDigit(FINGERS, 20, AAOS) },
    primeMovers: ["dorsal interossei", "abductor digiti minimi (little)"],
    cameraView: "overhead",
    testPosition: {
      against_gravity: "Hand on its little-finger edge (index side up for the index finger); the client spreads the finger upward.",
      gravity_minimized: "Palm flat on the table; the client spreads the fingers apart along the table surface.",
    },
  },
  "finger.adduction": {
    id: "finger.adduction",
    label: "Finger adduction",
    joint: "mcp",
    digits: ["index", "ring", "little"],
    signConvention: "positive as the finger moves toward the middle finger's line in the plane of the palm; graded on the arc back from spread",
    gradedOn: "arc",
    normalEndRange: { aaos1965: perDigit(["index", "ring", "little"], 20, `${AAOS}: finger abduction 20, the arc from full spread back to the midline`) },
    primeMovers: ["palmar interossei"],
    cameraView: "overhead",
    testPosition: {
      against_gravity: "Hand on its edge with the finger spread and facing down; the client brings the finger up toward its neighbour.",
      gravity_minimized: "Palm flat on the table with the fingers spread; the client brings the finger back alongside the middle finger.",
    },
  },
};

export function isMotionId(value: string): value is MotionId {
  return (MOTION_IDS as readonly string[]).includes(value);
}

export function getMotion(id: MotionId): MotionDefinition {
  return MOTIONS[id];
}

/** Whether a motion is measured on the wrist (digit must be null) or on a digit listed in the catalog. */
export function digitAllowed(motion: MotionId, digit: Digit | null): boolean {
  const def = MOTIONS[motion];
  if (def.joint === "wrist") return digit === null;
  return digit !== null && def.digits.includes(digit);
}

/**
 * Motions a finger can be tested on alone, the other three held straight (as a therapist isolates one finger):
 * flexion and extension at a finger's (not the thumb's) MCP, PIP or DIP.
 */
export function isOneFingerMotion(motion: MotionId, digit: Digit | null): boolean {
  const finger = digit !== null && digit !== "thumb";
  return finger && (motion === "mcp.flexion" || motion === "mcp.extension" || motion === "pip.flexion" || motion === "dip.flexion" || motion === "ip.extension");
}

export interface ReferenceEndRange {
  endRangeDeg: number;
  source: string;
  table: RangeTableId;
}

/**
 * The normal end-range of a motion in the chosen table. Finger and thumb values exist only in some tables; where the
 * chosen table has none, the AAOS 1965 value is returned and its source says the fallback happened.
 */
export function getReferenceEndRange(motion: MotionId, digit: Digit | null, table: RangeTableId = DEFAULT_RANGE_TABLE): ReferenceEndRange | null {
  const def = MOTIONS[motion];
  const key: RangeKey = def.joint === "wrist" ? "wrist" : (digit ?? "index");
  if (!digitAllowed(motion, digit)) return null;
  const chosen = def.normalEndRange[table]?.[key];
  if (chosen) return { endRangeDeg: chosen.deg, source: chosen.source, table };
  const fallback = def.normalEndRange[DEFAULT_RANGE_TABLE]?.[key];
  if (!fallback) return null;
  return {
    endRangeDeg: fallback.deg,
    source: `${fallback.source} (no ${RANGE_TABLES[table].label} value for this motion; AAOS 1965 used)`,
    table: DEFAULT_RANGE_TABLE,
  };
}
