import { createServer } from "node:http";
import path from "node:path";
import { build } from "esbuild";

export interface HarnessSite {
  /** Page to open in Chromium; it exposes `window.videoHarness`. */
  url: string;
  close(): Promise<void>;
}

const PAGE = `<!doctype html>
<html lang="en">
<head><meta charset="utf-8"><title>Kinarc video harness</title></head>
<body><script type="module" src="/page.js"></script></body>
</html>`;

/**
 * Bundles page.ts with esbuild and serves it over http://localhost, which browsers treat as a secure
 * context (getUserMedia and WebRTC need one).
 */
export async function serveVideoHarness(port: number): Promise<HarnessSite> {
  const bundle = await build({
    entryPoints: [path.join(import.meta.dirname, "page.ts")],
    bundle: true,
    format: "esm",
    platform: "browser",
    target: "es2022",
    write: false,
    logLevel: "silent",
  });
  const script = bundle.outputFiles[0].text;
  const server = createServer((request, response) => {
    if (request.url === "/page.js") {
      response.writeHead(200, { "content-type": "text/javascript; charset=utf-8" });
      response.end(script);
    } else if (request.url === "/") {
      response.writeHead(200, { "content-type": "text/html; charset=utf-8" });
      response.end(PAGE);
    } else {
      response.writeHead(404).end();
    }
  });
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(port, "127.0.0.1", () => resolve());
  });
  return {
    url: `http://localhost:${port}/`,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
