import { existsSync, readFileSync, readdirSync, statSync } from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";
import type { Browser, Page } from "playwright-core";
import { build } from "vite";
import { launchChromium } from "../../tests/e2e/support/browser";
import type { RenderFrameSpec } from "./render-spec";
import { handMeshFolder } from "./rig-files";

const REPO_ROOT = path.resolve(fileURLToPath(new URL(".", import.meta.url)), "..", "..");
export const RENDER_PAGE_SOURCE = path.join(REPO_ROOT, "tests", "harness", "render");
export const RENDER_PAGE_BUILD = path.join(REPO_ROOT, "tests", ".cache", "render-page");
export const RENDER_OUTPUT_ROOT = path.join(REPO_ROOT, "tests", ".cache", "renders");

/** The page is served from a made-up origin through request interception: no port, no server to leak. */
const PAGE_ORIGIN = "http://render.kinarc.invalid";

function newestMtimeMs(paths: string[]): number {
  let newest = 0;
  for (const entry of paths) {
    const stat = statSync(entry);
    if (stat.isDirectory()) {
      newest = Math.max(newest, newestMtimeMs(readdirSync(entry).map((name) => path.join(entry, name))));
    } else newest = Math.max(newest, stat.mtimeMs);
  }
  return newest;
}

/** Bundles the render page with vite when its sources are newer than the last build. */
export async function buildRenderPage(): Promise<string> {
  const builtIndex = path.join(RENDER_PAGE_BUILD, "index.html");
  const sources = [RENDER_PAGE_SOURCE, path.join(REPO_ROOT, "scripts", "accuracy", "render-spec.ts")];
  if (existsSync(builtIndex) && statSync(builtIndex).mtimeMs >= newestMtimeMs(sources)) return RENDER_PAGE_BUILD;
  await build({
    root: RENDER_PAGE_SOURCE,
    base: "./",
    configFile: false,
    logLevel: "warn",
    build: {
      outDir: RENDER_PAGE_BUILD,
      emptyOutDir: true,
      target: "es2022",
      chunkSizeWarningLimit: 2000,
      // Chromium needs no polyfill, and vite cannot resolve its own when loaded from a CommonJS script.
      modulePreload: { polyfill: false },
    },
  });
  return RENDER_PAGE_BUILD;
}

const CONTENT_TYPES: Record<string, string> = {
  ".html": "text/html",
  ".js": "text/javascript",
  ".css": "text/css",
  ".glb": "model/gltf-binary",
};

/**
 * Headless Chromium (software WebGL) with the render page loaded. One page renders frames in batches: each
 * round trip to the browser costs more than drawing a frame.
 */
export class HandRenderer {
  private constructor(
    private readonly browser: Browser,
    private readonly page: Page,
  ) {}

  static async start(): Promise<HandRenderer> {
    const pageFolder = await buildRenderPage();
    const meshFolder = handMeshFolder();
    const browser = await launchChromium({
      // Software WebGL: SwiftShader through ANGLE, the only GL this machine has.
      extraArgs: ["--use-angle=swiftshader", "--enable-unsafe-swiftshader", "--ignore-gpu-blocklist"],
    });
    try {
      const page = await browser.newPage({ viewport: { width: 640, height: 480 } });
      const pageErrors: string[] = [];
      page.on("pageerror", (error) => pageErrors.push(error.message));
      await page.route(`${PAGE_ORIGIN}/**`, async (route) => {
        const pathname = decodeURIComponent(new URL(route.request().url()).pathname);
        const file = pathname.startsWith("/hand-meshes/")
          ? path.join(meshFolder, path.basename(pathname))
          : path.join(pageFolder, path.normalize(pathname).replace(/^\/+/, ""));
        if (!file.startsWith(pageFolder) && !file.startsWith(meshFolder)) return route.fulfill({ status: 403 });
        if (!existsSync(file)) return route.fulfill({ status: 404, body: `not found: ${pathname}` });
        return route.fulfill({
          status: 200,
          body: readFileSync(file),
          headers: { "content-type": CONTENT_TYPES[path.extname(file)] ?? "application/octet-stream" },
        });
      });
      await page.goto(`${PAGE_ORIGIN}/index.html`);
      try {
        await page.waitForFunction(() => "kinarcRender" in window, undefined, { timeout: 30_000 });
        await page.evaluate(() => (window as unknown as { kinarcRender: { ready: Promise<void> } }).kinarcRender.ready);
      } catch (error) {
        throw new Error(`render page did not load: ${pageErrors.join("; ") || (error as Error).message}`);
      }
      return new HandRenderer(browser, page);
    } catch (error) {
      await browser.close();
      throw error;
    }
  }

  /** JPEG bytes for each spec, in order. */
  async render(specs: RenderFrameSpec[]): Promise<Buffer[]> {
    const urls = await this.page.evaluate(
      (batch) =>
        (window as unknown as { kinarcRender: { renderFrames(s: typeof batch): string[] } }).kinarcRender.renderFrames(batch),
      specs,
    );
    return urls.map((url, index) => {
      const prefix = "data:image/jpeg;base64,";
      if (!url.startsWith(prefix)) throw new Error(`render page returned no JPEG for frame ${index}`);
      return Buffer.from(url.slice(prefix.length), "base64");
    });
  }

  /** Which WebGL implementation drew the frames, for the record. */
  async glRenderer(): Promise<string> {
    return this.page.evaluate(() => {
      const gl = document.createElement("canvas").getContext("webgl2");
      if (!gl) return "no WebGL2";
      const debug = gl.getExtension("WEBGL_debug_renderer_info");
      return String(gl.getParameter(debug ? debug.UNMASKED_RENDERER_WEBGL : gl.RENDERER));
    });
  }

  async close(): Promise<void> {
    await this.browser.close();
  }
}
