import { createJiti } from "jiti";

// Validate the environment at build and start: a bad or missing value stops here with a message naming it.
const jiti = createJiti(import.meta.url);
const { env } = await jiti.import("./lib/env.ts");
const e = env();

/** The video server's origin in both ws and http form (the client SDK uses both). */
function videoOrigins(url) {
  const u = new URL(url);
  const http = u.protocol === "wss:" ? "https:" : "http:";
  return [`${u.protocol}//${u.host}`, `${http}//${u.host}`];
}

const dev = process.env.NODE_ENV === "development";
// Local deployments (demo, tests) run the media server stand-in on a port of their choosing on this machine.
const local = e.KINARC_DEPLOYMENT === "local";

// Only Kinarc's own origin and the configured video server. 'wasm-unsafe-eval' lets the hand tracker's WebAssembly
// run; no third-party origin is listed, so no health data can be sent elsewhere by a script on the page.
const csp = [
  "default-src 'self'",
  `script-src 'self' 'unsafe-inline' 'wasm-unsafe-eval'${dev ? " 'unsafe-eval'" : ""}`,
  "style-src 'self' 'unsafe-inline'",
  "img-src 'self' data: blob:",
  "media-src 'self' blob: mediastream:",
  "font-src 'self'",
  `connect-src 'self' ${videoOrigins(e.LIVEKIT_URL).join(" ")}${dev || local ? " ws://localhost:* http://localhost:* ws://127.0.0.1:*" : ""}`,
  "worker-src 'self' blob:",
  "frame-ancestors 'none'",
  "object-src 'none'",
  "base-uri 'self'",
  "form-action 'self'",
].join("; ");

const securityHeaders = [
  { key: "Content-Security-Policy", value: csp },
  { key: "X-Content-Type-Options", value: "nosniff" },
  { key: "Referrer-Policy", value: "strict-origin-when-cross-origin" },
  { key: "X-Frame-Options", value: "DENY" },
  { key: "Permissions-Policy", value: "camera=(self), microphone=(self), geolocation=(), payment=(self)" },
  { key: "Cross-Origin-Opener-Policy", value: "same-origin" },
  // Browsers must come back over HTTPS only; a local install runs on plain http, where this header would be wrong.
  ...(e.KINARC_DEPLOYMENT === "production" ? [{ key: "Strict-Transport-Security", value: "max-age=63072000; includeSubDomains" }] : []),
];

/** @type {import('next').NextConfig} */
const nextConfig = {
  reactStrictMode: true,
  poweredByHeader: false,
  // Types are checked once for the whole repository by `npm run typecheck` (a step of `npm test`), not again here.
  typescript: { ignoreBuildErrors: true },
  serverExternalPackages: ["@libsql/client", "libsql", "@node-rs/argon2", "werift"],
  async headers() {
    return [{ source: "/:path*", headers: securityHeaders }];
  },
};

export default nextConfig;
