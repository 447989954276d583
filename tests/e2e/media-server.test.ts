import { randomBytes } from "node:crypto";
import { AccessToken } from "livekit-server-sdk";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { type MediaServer, startMediaServer } from "@/scripts/media-server/server";
import { type HarnessSite, serveVideoHarness } from "@/tests/harness/video/serve";
import type { HarnessState, JoinOptions } from "@/tests/harness/video/page";
import { launchChromium } from "./support/browser";

// Two headless Chromium pages run the unmodified livekit-client 2.23.0 (registry package) against the
// development media server. Chromium's built-in fake camera draws a moving test pattern, so frames that keep
// advancing on the receiving page are the publisher's camera coming through.

const MEDIA_PORT = 7886;
const HARNESS_PORT = 7887;
const API_KEY = "e2e-key";
const API_SECRET = randomBytes(32).toString("hex");

let media: MediaServer;
let site: HarnessSite;
let browser: Browser;

beforeAll(async () => {
  media = await startMediaServer({ port: MEDIA_PORT, apiKey: API_KEY, apiSecret: API_SECRET });
  site = await serveVideoHarness(HARNESS_PORT);
  browser = await launchChromium({
    extraArgs: ["--use-fake-device-for-media-stream", "--use-fake-ui-for-media-stream"],
  });
});

afterAll(async () => {
  await browser?.close();
  await site?.close();
  await media?.close();
});

async function openPage(): Promise<Page> {
  const page = await (await browser.newContext()).newPage();
  await page.goto(site.url);
  await page.waitForFunction(() => "videoHarness" in window);
  return page;
}

async function joinAs(page: Page, room: string, identity: string, options: JoinOptions): Promise<void> {
  const accessToken = new AccessToken(API_KEY, API_SECRET, { identity, ttl: "10m" });
  accessToken.addGrant({ roomJoin: true, room });
  const jwt = await accessToken.toJwt();
  await page.evaluate(
    ([url, token, joinOptions]) => window.videoHarness.join(url, token, joinOptions),
    [media.url, jwt, options] as const,
  );
}

const snapshot = (page: Page): Promise<HarnessState> => page.evaluate(() => window.videoHarness.snapshot());

/** Polls the page until `accept` holds, or fails with the last state seen. */
async function until(page: Page, what: string, accept: (state: HarnessState) => boolean, timeoutMs = 20_000) {
  const deadline = Date.now() + timeoutMs;
  let state = await snapshot(page);
  while (!accept(state)) {
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}; last state: ${JSON.stringify(state)}`);
    await new Promise((resolve) => setTimeout(resolve, 200));
    state = await snapshot(page);
  }
  return state;
}

describe("development media server with livekit-client in two Chromium pages", () => {
  it("carries camera, microphone, data, mute, unpublish and leave from one page to the other", async () => {
    const therapist = await openPage();
    const client = await openPage();
    // The therapist greets the client the moment it appears, before the client's data channels are open.
    await joinAs(therapist, "visit-1", "therapist-b", { singlePeerConnection: false, greeting: "welcome" });
    // The client page takes livekit-client's default single-connection path first and must fall back.
    await joinAs(client, "visit-1", "client-a", { singlePeerConnection: true });
    await until(client, "the client to see the therapist", (s) => s.remoteIdentities.includes("therapist-b"));
    const greeted = await until(client, "the therapist's greeting", (s) => s.messages.length > 0);
    expect(greeted.messages).toEqual([{ fromIdentity: "therapist-b", text: "welcome", topic: undefined }]);

    await client.evaluate(() => window.videoHarness.publishCameraAndMicrophone());
    const playing = await until(therapist, "the client's video frames", (s) => (s.videoFramesByIdentity["client-a"] ?? 0) >= 30);
    expect(playing.subscribedKindsByIdentity["client-a"]?.sort()).toEqual(["audio", "video"]);
    expect(playing.videoMimeTypeByIdentity["client-a"]?.toLowerCase()).toBe("video/vp8");
    // currentTime advancing is the picture moving, not just one decoded frame.
    const timeBeforeS = playing.videoTimeSByIdentity["client-a"];
    await new Promise((resolve) => setTimeout(resolve, 1500));
    const later = await snapshot(therapist);
    expect(later.videoTimeSByIdentity["client-a"]).toBeGreaterThan(timeBeforeS + 0.5);
    expect(later.videoFramesByIdentity["client-a"]).toBeGreaterThan(playing.videoFramesByIdentity["client-a"]);

    // Reliable messages keep their order, so the one addressed elsewhere, sent first, would be seen first.
    await client.evaluate(async () => {
      await window.videoHarness.sendText("not for you", { reliable: true, destinationIdentities: ["someone-else"] });
      await window.videoHarness.sendText("reliable hello", { reliable: true, topic: "telemetry" });
      await window.videoHarness.sendText("lossy hello", { reliable: false, destinationIdentities: ["therapist-b"] });
    });
    const messaged = await until(therapist, "both messages", (s) => s.messages.length >= 2);
    expect(messaged.messages).toContainEqual({ fromIdentity: "client-a", text: "reliable hello", topic: "telemetry" });
    expect(messaged.messages).toContainEqual({ fromIdentity: "client-a", text: "lossy hello", topic: undefined });
    expect(messaged.messages.map((m) => m.text)).not.toContain("not for you");

    await client.evaluate(() => window.videoHarness.setCameraMuted(true));
    await until(therapist, "the camera muted", (s) => (s.mutedKindsByIdentity["client-a"] ?? []).includes("video"));
    await client.evaluate(() => window.videoHarness.setCameraMuted(false));
    await until(therapist, "the camera unmuted", (s) => !(s.mutedKindsByIdentity["client-a"] ?? []).includes("video"));
    await client.evaluate(() => window.videoHarness.unpublishMicrophone());
    const unpublished = await until(therapist, "the microphone unpublished", (s) =>
      (s.unpublishedKindsByIdentity["client-a"] ?? []).includes("audio"),
    );
    expect(unpublished.unpublishedKindsByIdentity["client-a"]).toEqual(["audio"]);

    await client.evaluate(() => window.videoHarness.leave());
    const departed = await until(therapist, "the client to leave", (s) => s.departedIdentities.includes("client-a"));
    expect(departed.remoteIdentities).not.toContain("client-a");
  });

  it("lets a page whose signalling socket dropped rejoin, on the receiving and on the publishing side", async () => {
    const therapist = await openPage();
    const client = await openPage();
    await joinAs(client, "visit-2", "client-a", { singlePeerConnection: false });
    await joinAs(therapist, "visit-2", "therapist-b", { singlePeerConnection: false });
    // H264 this time: the server must answer with the codec the client asked for, not its own first choice.
    await client.evaluate(() => window.videoHarness.publishCameraAndMicrophone("h264"));
    const playing = await until(therapist, "the client's video frames", (s) => (s.videoFramesByIdentity["client-a"] ?? 0) >= 10);
    expect(playing.videoMimeTypeByIdentity["client-a"]?.toLowerCase()).toBe("video/h264");

    await therapist.evaluate(() => window.videoHarness.dropSignalConnection());
    const rejoined = await until(therapist, "the reconnection", (s) => s.reconnections >= 1 && s.connectionState === "connected");
    // The server ended the old session when its socket closed; the client saw the therapist leave and come back.
    await until(client, "the therapist's return", (s) => s.departedIdentities.includes("therapist-b") && s.remoteIdentities.includes("therapist-b"));
    const framesAtRejoin = rejoined.videoFramesByIdentity["client-a"] ?? 0;
    await until(therapist, "frames after the rejoin", (s) => (s.videoFramesByIdentity["client-a"] ?? 0) >= framesAtRejoin + 30);

    // Now the publishing side drops: it rejoins and publishes again, and the picture comes back.
    await client.evaluate(() => window.videoHarness.dropSignalConnection());
    await until(client, "the client's reconnection", (s) => s.reconnections >= 1 && s.connectionState === "connected");
    const republished = await until(therapist, "the client's second camera track", (s) =>
      (s.subscribedKindsByIdentity["client-a"] ?? []).filter((kind) => kind === "video").length >= 2,
    );
    const framesAtRepublish = republished.videoFramesByIdentity["client-a"] ?? 0;
    await until(therapist, "frames from the republished camera", (s) => (s.videoFramesByIdentity["client-a"] ?? 0) >= framesAtRepublish + 30);

    await therapist.evaluate(() => window.videoHarness.leave());
    await until(client, "the therapist to leave", (s) => !s.remoteIdentities.includes("therapist-b"));
  });
});
