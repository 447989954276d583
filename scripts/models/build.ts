/**
 * Builds the hand and pose model bundles (`.task`) from the files shipped in registry packages and copies the tasks
 * library's wasm next to them. Nothing is fetched: every input comes from node_modules and is checked by SHA-256.
 */
import { createHash } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { MODEL_BUNDLES, RECIPE_VERSION, SOURCE_FILES, type BundleRecipe, type ModelSource, type SourceId } from "./recipe";
import { writeStoredZip } from "./stored-zip";
import { buildImageInputMetadata, injectTfliteMetadata } from "./tflite-metadata";

const STAMP_FILE = ".kinarc-models.json";

export interface BuildModelsOptions {
  /** Folder holding node_modules (the repository root). */
  repoRoot: string;
  /** Where bundles go; default `<repoRoot>/public/models`. */
  modelsDir?: string;
  /** Where the tasks wasm goes; default `<repoRoot>/public/mediapipe/wasm`. */
  wasmDir?: string;
  /** Rebuild even when the outputs look current. */
  force?: boolean;
  log?: (line: string) => void;
}

export interface BuildModelsResult {
  built: string[];
  upToDate: string[];
  wasmFilesCopied: number;
}

interface Stamp {
  recipeVersion: number;
  sources: Record<string, string>;
  outputs: Record<string, { bytes: number; sha256: string }>;
}

export function sha256Hex(bytes: Uint8Array): string {
  return createHash("sha256").update(bytes).digest("hex");
}

export function buildModels(options: BuildModelsOptions): BuildModelsResult {
  const { repoRoot, force = false, log = () => {} } = options;
  const modelsDir = options.modelsDir ?? path.join(repoRoot, "public", "models");
  const wasmDir = options.wasmDir ?? path.join(repoRoot, "public", "mediapipe", "wasm");
  const sources = loadVerifiedSources(repoRoot);
  const sourceChecksums = Object.fromEntries(Object.entries(SOURCE_FILES).map(([id, s]) => [id, s.sha256]));

  fs.mkdirSync(modelsDir, { recursive: true });
  const stampPath = path.join(modelsDir, STAMP_FILE);
  const stamp = readStamp(stampPath);
  const stampCurrent =
    stamp !== null && stamp.recipeVersion === RECIPE_VERSION && JSON.stringify(stamp.sources) === JSON.stringify(sourceChecksums);

  const result: BuildModelsResult = { built: [], upToDate: [], wasmFilesCopied: 0 };
  const outputs: Stamp["outputs"] = {};
  for (const recipe of MODEL_BUNDLES) {
    const outPath = path.join(modelsDir, recipe.file);
    const previous = stamp?.outputs[recipe.file];
    if (!force && stampCurrent && previous && fs.existsSync(outPath) && fs.statSync(outPath).size === previous.bytes) {
      outputs[recipe.file] = previous;
      result.upToDate.push(recipe.file);
      continue;
    }
    const bundle = buildBundle(recipe, sources);
    // Write then rename so a crash never leaves a truncated bundle that looks current.
    fs.writeFileSync(`${outPath}.tmp`, bundle);
    fs.renameSync(`${outPath}.tmp`, outPath);
    outputs[recipe.file] = { bytes: bundle.length, sha256: sha256Hex(bundle) };
    result.built.push(recipe.file);
    log(`built ${path.relative(repoRoot, outPath)} (${(bundle.length / 1e6).toFixed(1)} MB)`);
  }
  fs.writeFileSync(stampPath, JSON.stringify({ recipeVersion: RECIPE_VERSION, sources: sourceChecksums, outputs }, null, 2));

  result.wasmFilesCopied = copyWasm(path.join(repoRoot, "node_modules", "@mediapipe", "tasks-vision", "wasm"), wasmDir);
  if (result.wasmFilesCopied) log(`copied ${result.wasmFilesCopied} wasm file(s) to ${path.relative(repoRoot, wasmDir)}`);
  if (result.upToDate.length) log(`up to date: ${result.upToDate.join(", ")}`);
  return result;
}

export function buildBundle(recipe: BundleRecipe, sources: Map<SourceId, Uint8Array>): Uint8Array {
  const entries = recipe.entries.map((entry) => {
    const model = resolveModel(entry.from, sources);
    const metadata = buildImageInputMetadata({ modelName: entry.name.replace(/\.tflite$/, ""), mean: entry.mean, std: entry.std });
    return { name: entry.name, data: injectTfliteMetadata(model, metadata) };
  });
  return writeStoredZip(entries);
}

/** Reads every source file and checks its SHA-256 against the recipe. */
export function loadVerifiedSources(repoRoot: string): Map<SourceId, Uint8Array> {
  const sources = new Map<SourceId, Uint8Array>();
  for (const [id, source] of Object.entries(SOURCE_FILES) as [SourceId, (typeof SOURCE_FILES)[SourceId]][]) {
    const filePath = path.join(repoRoot, "node_modules", source.packageName, source.file);
    if (!fs.existsSync(filePath)) {
      throw new Error(`${source.packageName}/${source.file}: missing; run npm install (the package must be a dependency)`);
    }
    const bytes = new Uint8Array(fs.readFileSync(filePath));
    const actual = sha256Hex(bytes);
    if (actual !== source.sha256) {
      throw new Error(`${source.packageName}/${source.file}: SHA-256 ${actual} does not match the expected ${source.sha256}`);
    }
    sources.set(id, bytes);
  }
  return sources;
}

export interface PackedFileRange {
  filename: string;
  start: number;
  end: number;
}

/** Byte ranges of the files concatenated in a packed-assets blob, read from its loader script's `loadPackage` call. */
export function parsePackedListing(loaderScript: string): PackedFileRange[] {
  const pattern = /\{\s*"filename"\s*:\s*"([^"]+)"\s*,\s*"start"\s*:\s*(\d+)\s*,\s*"end"\s*:\s*(\d+)\s*\}/g;
  return Array.from(loaderScript.matchAll(pattern), (m) => ({ filename: m[1], start: Number(m[2]), end: Number(m[3]) }));
}

function resolveModel(from: ModelSource, sources: Map<SourceId, Uint8Array>): Uint8Array {
  if ("source" in from) return sources.get(from.source)!;
  const listing = parsePackedListing(new TextDecoder().decode(sources.get(from.listing)!));
  const range = listing.find((r) => path.posix.basename(r.filename) === from.filename);
  if (!range) throw new Error(`${SOURCE_FILES[from.listing].file}: no entry named ${from.filename}`);
  const blob = sources.get(from.packed)!;
  if (range.end > blob.length || range.start >= range.end) {
    throw new Error(`${from.filename}: range ${range.start}-${range.end} lies outside ${SOURCE_FILES[from.packed].file} (${blob.length} bytes)`);
  }
  const model = blob.subarray(range.start, range.end);
  if (new TextDecoder().decode(model.subarray(4, 8)) !== "TFL3") {
    throw new Error(`${from.filename}: expected a TFLite model (identifier TFL3 at bytes 4-8)`);
  }
  return model;
}

function readStamp(stampPath: string): Stamp | null {
  try {
    return JSON.parse(fs.readFileSync(stampPath, "utf8")) as Stamp;
  } catch {
    return null;
  }
}

function copyWasm(fromDir: string, toDir: string): number {
  if (!fs.existsSync(fromDir)) throw new Error(`${fromDir}: missing; is @mediapipe/tasks-vision installed?`);
  fs.mkdirSync(toDir, { recursive: true });
  let copied = 0;
  for (const name of fs.readdirSync(fromDir)) {
    const from = path.join(fromDir, name);
    const to = path.join(toDir, name);
    const src = fs.statSync(from);
    if (!src.isFile()) continue;
    const dst = fs.existsSync(to) ? fs.statSync(to) : null;
    if (dst && dst.size === src.size && dst.mtimeMs >= src.mtimeMs) continue;
    fs.copyFileSync(from, to);
    copied++;
  }
  return copied;
}
