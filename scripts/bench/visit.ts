/**
 * Video visit benchmark: the real app with the local media server, a client whose fake camera shows real hand photos
 * and a therapist, as in tests/e2e/visits.test.ts. Prints the data the therapist's browser receives per second while
 * the client is tracked (LiveKit data messages, framing included) and the delay from the client sending a telemetry
 * packet to the therapist's overlay drawing it (both browsers share this machine's clock). Figures only.
 * Goals: under 4 KB/s, under 250 ms.
 *
 *   npx tsx scripts/bench/visit.ts [--seconds 10]
 */
import { openDatabase } from "@/db";
import { consents, visits } from "@/db/schema";
import { DEMO_PASSWORD } from "@/db/seed/demo";
import { consentTextSha256, TELEHEALTH_CONSENT } from "@/lib/consent/telehealth";
import { signInWithPassword, startTestApp } from "../../tests/e2e/support/app";
import { launchChromium } from "../../tests/e2e/support/browser";
import { makeHandClip, STANDARD_CLIPS, type ClipSpec } from "../fixtures/hand-photos";

function argument(name: string, fallback: string): string {
  const i = process.argv.indexOf(`--${name}`);
  return i >= 0 && process.argv[i + 1] ? process.argv[i + 1] : fallback;
}

// Counts every byte of data-channel messages the page receives, and turns on the console's delay log.
const INSTRUMENT = `
  window.__kinarcOverlayDelays = [];
  window.__kinarcDataBytes = 0;
  const d = Object.getOwnPropertyDescriptor(RTCDataChannel.prototype, "onmessage");
  Object.defineProperty(RTCDataChannel.prototype, "onmessage", {
    configurable: true,
    get() { return d.get.call(this); },
    set(fn) {
      d.set.call(this, fn && function (ev) {
        const data = ev.data;
        window.__kinarcDataBytes += data.byteLength ?? data.size ?? data.length ?? 0;
        return fn.call(this, ev);
      });
    },
  });
`;

const quantile = (xs: number[], q: number) => {
  const s = [...xs].sort((a, b) => a - b);
  return s.length ? s[Math.min(s.length - 1, Math.floor(q * s.length))] : NaN;
};

async function main() {
  const seconds = Number(argument("seconds", "10"));
  if (!(seconds > 0)) throw new Error(`--seconds: expected a positive number`);
  const clip = makeHandClip(STANDARD_CLIPS.openFistCamera as ClipSpec);
  const app = await startTestApp("bench-visit");
  const therapistBrowser = await launchChromium({ extraArgs: ["--use-fake-device-for-media-stream", "--use-fake-ui-for-media-stream"] });
  const clientBrowser = await launchChromium({ fakeCameraClip: clip });
  try {
    const { db, client } = openDatabase(app.databaseUrl);
    const [visit] = await db
      .insert(visits)
      .values({ clinicId: (await db.query.clinics.findFirst())!.id, clientId: app.seed.clientIds!.dorian, therapistId: (await db.query.users.findFirst({ where: (u, { eq }) => eq(u.email, "therapist@kinarc.test") }))!.id, startsAt: new Date(), durationMin: 30 })
      .returning();
    await db.insert(consents).values({ clientId: app.seed.clientIds!.dorian, kind: "telehealth", version: TELEHEALTH_CONSENT.version, textSha256: consentTextSha256(), signedName: "Dorian Vale", signedAt: new Date() });
    client.close();

    const therapistContext = await therapistBrowser.newContext({ permissions: ["camera", "microphone"] });
    await therapistContext.addInitScript(INSTRUMENT);
    const therapist = await therapistContext.newPage();
    const clientPage = await (await clientBrowser.newContext({ permissions: ["camera", "microphone"] })).newPage();
    await signInWithPassword(clientPage, app.appUrl, "client@kinarc.test", DEMO_PASSWORD);
    await clientPage.waitForURL(`${app.appUrl}/home`);
    await clientPage.goto(`${app.appUrl}/visits/${visit.id}`);
    const join = clientPage.getByRole("button", { name: "Join the visit" });
    while (!(await join.isEnabled())) await clientPage.waitForTimeout(250);
    await join.click();
    await signInWithPassword(therapist, app.appUrl, "therapist@kinarc.test", DEMO_PASSWORD);
    await therapist.waitForURL(`${app.appUrl}/home`);
    await therapist.goto(`${app.appUrl}/visits/${visit.id}`);
    await therapist.getByRole("button", { name: "Join the visit" }).click();
    const picker = therapist.getByRole("form", { name: "Next test" });
    await picker.getByRole("button", { name: "Ask the client to do this" }).waitFor();
    while (!(await picker.getByRole("button", { name: "Ask the client to do this" }).isEnabled())) await therapist.waitForTimeout(250);
    await picker.getByLabel("Motion").selectOption({ label: "PIP flexion" });
    await picker.getByRole("button", { name: "Ask the client to do this" }).click();
    await therapist.waitForTimeout(3000);

    await therapist.evaluate(() => {
      const w = window as unknown as { __kinarcOverlayDelays: number[]; __kinarcDataBytes: number };
      w.__kinarcOverlayDelays.length = 0;
      w.__kinarcDataBytes = 0;
    });
    await therapist.waitForTimeout(seconds * 1000);
    const { bytes, delays, videoDelayMs } = await therapist.evaluate(() => {
      const w = window as unknown as { __kinarcOverlayDelays: number[]; __kinarcDataBytes: number; __kinarcVideoDelayMs?: number };
      return { bytes: w.__kinarcDataBytes, delays: [...w.__kinarcOverlayDelays], videoDelayMs: w.__kinarcVideoDelayMs ?? null };
    });
    console.log(`visit: data received by the therapist: ${(bytes / seconds / 1024).toFixed(2)} KB/s (goal < 4 KB/s)`);
    console.log(`visit: overlay frames drawn: ${(delays.length / seconds).toFixed(1)} per second`);
    console.log(`visit: telemetry send → overlay drawn: median ${quantile(delays, 0.5).toFixed(0)} ms, p95 ${quantile(delays, 0.95).toFixed(0)} ms (goal < 250 ms; includes the hold for the video's playout delay)`);
    console.log(`visit: video jitter-buffer delay the overlay waits for: ${videoDelayMs === null ? "not measured" : `${videoDelayMs.toFixed(0)} ms`}`);
    console.log(`visit: machine load average during the run: ${(await import("node:os")).loadavg()[0].toFixed(1)} on ${(await import("node:os")).cpus().length} cores`);
    console.log("visit: add the tracker's frame-to-landmarks time (npm run bench -- tracking) for the full capture-to-overlay delay");
  } finally {
    await therapistBrowser.close();
    await clientBrowser.close();
    await app.stop();
  }
}

main().catch((error) => {
  console.error(error instanceof Error ? error.message : error);
  process.exit(1);
});
