import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { unzipSync } from "fflate";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { buildBundle, buildModels, loadVerifiedSources, parsePackedListing, sha256Hex } from "./build";
import { MODEL_BUNDLES, SOURCE_FILES, type SourceId } from "./recipe";
import { listZipEntries, writeStoredZip } from "./stored-zip";
import {
  TFLITE_METADATA_NAME,
  buildImageInputMetadata,
  extractTfliteMetadata,
  injectTfliteMetadata,
  readImageInputMetadata,
  readTfliteModel,
} from "./tflite-metadata";

const repoRoot = path.resolve(__dirname, "..", "..");
let sources: Map<SourceId, Uint8Array>;
let tmp: string;

beforeAll(() => {
  sources = loadVerifiedSources(repoRoot);
  tmp = fs.mkdtempSync(path.join(os.tmpdir(), "kinarc-models-"));
});
afterAll(() => fs.rmSync(tmp, { recursive: true, force: true }));

// Entry names the tasks library looks up inside a bundle (MediaPipe tasks hand_landmarker / pose_landmarker graphs;
// listed in shared/notes/hand-models.md).
const EXPECTED_ENTRIES: Record<string, string[]> = {
  "hand_landmarker_lite.task": ["hand_detector.tflite", "hand_landmarks_detector.tflite"],
  "hand_landmarker_full.task": ["hand_detector.tflite", "hand_landmarks_detector.tflite"],
  "pose_landmarker_lite.task": ["pose_detector.tflite", "pose_landmarks_detector.tflite"],
  "pose_landmarker_full.task": ["pose_detector.tflite", "pose_landmarks_detector.tflite"],
};

describe("packed-assets listing", () => {
  it("finds the palm detectors at the byte ranges seen in @mediapipe/hands 0.4.1675469240", () => {
    const listing = parsePackedListing(new TextDecoder().decode(sources.get("handsPackedListing")));
    const byName = Object.fromEntries(listing.map((r) => [path.posix.basename(r.filename), r]));
    // Ranges recorded in shared/notes/hand-models.md from the package's own loader.
    expect(byName["palm_detection_full.tflite"]).toMatchObject({ start: 11, end: 2341291 });
    expect(byName["palm_detection_lite.tflite"]).toMatchObject({ start: 2341291, end: 4326731 });
  });
});

describe.each(MODEL_BUNDLES.map((b) => [b.file, b] as const))("bundle %s", (file, recipe) => {
  let bundle: Uint8Array;
  beforeAll(() => {
    bundle = buildBundle(recipe, sources);
  });

  it("is a zip of stored (uncompressed) entries with the expected names, data aligned to 64 bytes", () => {
    const entries = listZipEntries(bundle);
    expect(entries.map((e) => e.name)).toEqual(EXPECTED_ENTRIES[file]);
    for (const entry of entries) {
      // APPNOTE.TXT 4.4.5: compression method 0 = stored.
      expect(entry.compressionMethod).toBe(0);
      expect(entry.compressedSize).toBe(entry.uncompressedSize);
      expect(entry.dataOffset % 64).toBe(0);
    }
    // fflate (npm) reads the same archive independently, CRCs included.
    const unzipped = unzipSync(bundle);
    expect(Object.keys(unzipped).sort()).toEqual([...EXPECTED_ENTRIES[file]].sort());
    for (const entry of entries) {
      expect(sha256Hex(unzipped[entry.name])).toBe(sha256Hex(bundle.subarray(entry.dataOffset, entry.dataOffset + entry.compressedSize)));
    }
  });

  it("gives every model one metadata record with the recipe's normalisation, leaving the model bytes untouched", () => {
    const unzipped = unzipSync(bundle);
    for (const entry of recipe.entries) {
      const model = unzipped[entry.name];
      expect(new TextDecoder().decode(model.subarray(4, 8))).toBe("TFL3");
      const summary = readTfliteModel(model);
      expect(summary.metadata.filter((m) => m.name === TFLITE_METADATA_NAME)).toHaveLength(1);
      const metadata = readImageInputMetadata(extractTfliteMetadata(model)!);
      expect(metadata).toMatchObject({ colorSpace: 1, minParserVersion: "1.0.0", mean: [entry.mean], std: [entry.std] });
      // The original model follows a 64-byte aligned header unchanged.
      const headerBytes = model.length - originalLength(entry.from);
      expect(headerBytes % 64).toBe(0);
      expect(headerBytes).toBeLessThan(4096);
      const original = "source" in entry.from ? sources.get(entry.from.source)! : null;
      if (original) expect(sha256Hex(model.subarray(headerBytes))).toBe(sha256Hex(original));
    }
  });
});

function originalLength(from: (typeof MODEL_BUNDLES)[number]["entries"][number]["from"]): number {
  if ("source" in from) return sources.get(from.source)!.length;
  const listing = parsePackedListing(new TextDecoder().decode(sources.get(from.listing)));
  const range = listing.find((r) => r.filename.endsWith(`/${from.filename}`))!;
  return range.end - range.start;
}

describe("metadata injection", () => {
  const landmarks = () => sources.get("handLandmarkLite")!;
  const metadata = () => buildImageInputMetadata({ modelName: "hand_landmarks_detector", mean: 0, std: 255 });

  it("adds one buffer and keeps the model's version", () => {
    const before = readTfliteModel(landmarks());
    const after = readTfliteModel(injectTfliteMetadata(landmarks(), metadata()));
    expect(before.metadata.some((m) => m.name === TFLITE_METADATA_NAME)).toBe(false);
    expect(after.bufferCount).toBe(before.bufferCount + 1);
    expect(after.version).toBe(before.version);
    // Entries the model already had (e.g. min_runtime_version) are kept, plus ours.
    expect(after.metadata.map((m) => m.name)).toEqual([...before.metadata.map((m) => m.name), TFLITE_METADATA_NAME]);
  });

  it("refuses to inject twice", () => {
    const once = injectTfliteMetadata(landmarks(), metadata());
    expect(() => injectTfliteMetadata(once, metadata())).toThrow(/refusing to inject it twice/);
  });

  it("names the problem for bytes that are not a TFLite model", () => {
    expect(() => injectTfliteMetadata(new Uint8Array(64), metadata())).toThrow(/model: expected file identifier TFL3/);
    expect(() => buildImageInputMetadata({ modelName: "x", mean: 0, std: 0 })).toThrow(/std: expected a positive number/);
  });
});

describe("stored zip writer", () => {
  it("aligns data for odd name lengths and refuses duplicate names", () => {
    const zip = writeStoredZip([
      { name: "a.bin", data: new Uint8Array(3).fill(7) },
      { name: "longer-name.bin", data: new Uint8Array(101).fill(9) },
    ]);
    const entries = listZipEntries(zip);
    expect(entries.map((e) => e.dataOffset % 64)).toEqual([0, 0]);
    expect(Array.from(unzipSync(zip)["longer-name.bin"])).toEqual(new Array(101).fill(9));
    expect(() => writeStoredZip([{ name: "x", data: new Uint8Array(1) }, { name: "x", data: new Uint8Array(1) }])).toThrow(/unique/);
  });
});

describe("buildModels", () => {
  it("writes every bundle and the wasm, then does nothing on a second run", () => {
    const modelsDir = path.join(tmp, "models");
    const wasmDir = path.join(tmp, "wasm");
    const first = buildModels({ repoRoot, modelsDir, wasmDir });
    expect(first.built.sort()).toEqual(MODEL_BUNDLES.map((b) => b.file).sort());
    expect(first.wasmFilesCopied).toBe(fs.readdirSync(path.join(repoRoot, "node_modules/@mediapipe/tasks-vision/wasm")).length);
    const second = buildModels({ repoRoot, modelsDir, wasmDir });
    expect(second.built).toEqual([]);
    expect(second.wasmFilesCopied).toBe(0);
    // A truncated output is rebuilt.
    fs.truncateSync(path.join(modelsDir, "hand_landmarker_lite.task"), 100);
    expect(buildModels({ repoRoot, modelsDir, wasmDir }).built).toEqual(["hand_landmarker_lite.task"]);
  });

  it("refuses a source file whose checksum differs, naming it", () => {
    const fakeRoot = path.join(tmp, "fake-root");
    for (const source of Object.values(SOURCE_FILES)) {
      const dir = path.join(fakeRoot, "node_modules", source.packageName);
      fs.mkdirSync(dir, { recursive: true });
      fs.symlinkSync(path.join(repoRoot, "node_modules", source.packageName, source.file), path.join(dir, source.file));
    }
    const tampered = path.join(fakeRoot, "node_modules/@mediapipe/hands/hand_landmark_lite.tflite");
    fs.rmSync(tampered);
    fs.writeFileSync(tampered, sources.get("handLandmarkLite")!.subarray(0, 1000));
    expect(() => loadVerifiedSources(fakeRoot)).toThrow(/@mediapipe\/hands\/hand_landmark_lite.tflite: SHA-256 .* does not match/);
  });
});
