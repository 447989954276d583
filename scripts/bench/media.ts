/**
 * Media server benchmark: two headless Chromium pages (livekit-client, Chromium's fake camera and microphone)
 * join one room on the development media server; one publishes camera and microphone, the other receives.
 * Prints each page's join time (the publisher takes livekit-client's default single-connection path first and
 * falls back; the receiver goes straight to the two-connection path), the time from publishing to the first
 * frame on the other page, and the server's CPU and memory while it forwards. Figures only; the server runs in
 * its own process so its CPU is not mixed with the browser driver's.
 *
 *   npx tsx scripts/bench/media.ts [--seconds 10]
 */
import { fork } from "node:child_process";
import { randomBytes } from "node:crypto";
import { AccessToken } from "livekit-server-sdk";
import type { Page } from "playwright-core";
import { launchChromium } from "../../tests/e2e/support/browser";
import type { HarnessState } from "../../tests/harness/video/page";
import { serveVideoHarness } from "../../tests/harness/video/serve";
import { startMediaServer } from "../media-server/server";

const MEDIA_PORT = 7888;
const HARNESS_PORT = 7889;
const ROOM = "bench-room";

interface ServerCredentials {
  apiKey: string;
  apiSecret: string;
}

interface ServerUsage {
  cpuMicros: number;
  rssBytes: number;
  heapUsedBytes: number;
}

function argument(name: string, fallback: string): string {
  const i = process.argv.indexOf(`--${name}`);
  return i >= 0 && process.argv[i + 1] ? process.argv[i + 1] : fallback;
}

/** Child role: run the media server with a one-off key and report its own usage when asked. */
async function serve(): Promise<void> {
  const credentials: ServerCredentials = { apiKey: "bench-key", apiSecret: randomBytes(32).toString("hex") };
  const server = await startMediaServer({ port: MEDIA_PORT, ...credentials });
  process.on("message", (message) => {
    if (message === "usage") {
      const cpu = process.cpuUsage();
      const memory = process.memoryUsage();
      const usage: ServerUsage = { cpuMicros: cpu.user + cpu.system, rssBytes: memory.rss, heapUsedBytes: memory.heapUsed };
      process.send?.(usage);
    } else if (message === "stop") {
      void server.close().then(() => process.exit(0));
    }
  });
  process.send?.(credentials);
}

async function main(): Promise<void> {
  const seconds = Number(argument("seconds", "10"));
  if (!(seconds > 0)) throw new Error(`--seconds: expected a positive number, got ${argument("seconds", "")}`);
  const child = fork(import.meta.filename, ["--serve"], { execArgv: ["--import", "tsx"] });
  const nextMessage = () => new Promise<unknown>((resolve) => child.once("message", resolve));
  const usage = async () => {
    child.send("usage");
    return (await nextMessage()) as ServerUsage;
  };
  const { apiKey, apiSecret } = (await nextMessage()) as ServerCredentials;

  const site = await serveVideoHarness(HARNESS_PORT);
  const browser = await launchChromium({
    extraArgs: ["--use-fake-device-for-media-stream", "--use-fake-ui-for-media-stream"],
  });
  try {
    const openPage = async (identity: string, singlePeerConnection: boolean) => {
      const page = await (await browser.newContext()).newPage();
      await page.goto(site.url);
      await page.waitForFunction(() => "videoHarness" in window);
      const accessToken = new AccessToken(apiKey, apiSecret, { identity, ttl: "10m" });
      accessToken.addGrant({ roomJoin: true, room: ROOM });
      const jwt = await accessToken.toJwt();
      await page.evaluate(
        ([url, token, single]) => window.videoHarness.join(url, token, { singlePeerConnection: single }),
        [`ws://localhost:${MEDIA_PORT}`, jwt, singlePeerConnection] as const,
      );
      return page;
    };
    const snapshot = (page: Page): Promise<HarnessState> => page.evaluate(() => window.videoHarness.snapshot());

    const idle = await usage();
    const publisher = await openPage("bench-publisher", true);
    const receiver = await openPage("bench-receiver", false);
    const publishedAt = performance.now();
    await publisher.evaluate(() => window.videoHarness.publishCameraAndMicrophone());
    await receiver.waitForFunction(() => (window.videoHarness.snapshot().videoFramesByIdentity["bench-publisher"] ?? 0) > 0, null, {
      timeout: 30_000,
      polling: 20,
    });
    const firstFrameMs = performance.now() - publishedAt;

    // Settle, then measure steady forwarding.
    await receiver.waitForTimeout(2000);
    const from = { usage: await usage(), at: performance.now(), frames: (await snapshot(receiver)).videoFramesByIdentity["bench-publisher"] ?? 0 };
    await receiver.waitForTimeout(seconds * 1000);
    const to = { usage: await usage(), at: performance.now(), frames: (await snapshot(receiver)).videoFramesByIdentity["bench-publisher"] ?? 0 };
    const wallMs = to.at - from.at;

    const mb = (bytes: number) => (bytes / 1024 / 1024).toFixed(0);
    console.log("Development media server, two participants (one publishes camera + microphone, one receives)");
    console.log(`  join time, publisher (falls back):   ${(await snapshot(publisher)).joinMs?.toFixed(0)} ms`);
    console.log(`  join time, receiver (/rtc directly): ${(await snapshot(receiver)).joinMs?.toFixed(0)} ms`);
    console.log(`  publish to first frame on receiver:  ${firstFrameMs.toFixed(0)} ms`);
    console.log(`  frames shown on receiver:            ${(((to.frames - from.frames) * 1000) / wallMs).toFixed(1)} per second`);
    console.log(`  server CPU while forwarding:         ${(((to.usage.cpuMicros - from.usage.cpuMicros) / 1000 / wallMs) * 100).toFixed(1)} % of one core over ${(wallMs / 1000).toFixed(0)} s`);
    console.log(`  server memory (RSS) idle / forwarding: ${mb(idle.rssBytes)} MB / ${mb(to.usage.rssBytes)} MB (JS heap ${mb(to.usage.heapUsedBytes)} MB)`);
    await publisher.evaluate(() => window.videoHarness.leave());
    await receiver.evaluate(() => window.videoHarness.leave());
  } finally {
    await browser.close();
    await site.close();
    child.send("stop");
  }
}

if (process.argv.includes("--serve")) {
  void serve();
} else {
  main().catch((error: unknown) => {
    console.error(error);
    process.exitCode = 1;
  });
}
