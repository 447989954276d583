import { describe, expect, it } from "vitest";
import { CaptureOutbox, fetchSender, memoryStore, outcomeOf, retryDelayMs, RETRY_POLICY, runOutbox, type OutboxEntry, type SendOutcome } from "./outbox";

const saved = (uid: string): SendOutcome => ({
  kind: "saved",
  response: { created: true, attempt: { id: `a-${uid}`, captureUid: uid } as never },
});

function clock(start = 1_000_000) {
  let now = start;
  return { now: () => now, advance: (ms: number) => void (now += ms) };
}

function body(uid: string) {
  return { captureUid: uid, source: "self_check", clientId: "c", capture: { frames: [] } };
}

describe("retry delays", () => {
  // Exponential backoff with jitter ("Exponential Backoff And Jitter", M. Brooker, AWS Architecture Blog 2015)
  // [common practice]: each delay lies between half and all of a doubling ceiling, capped.
  it("double from 2 s, stay within half and all of the ceiling, and stop growing at 5 minutes", () => {
    expect(retryDelayMs(1, () => 0)).toBe(1_000);
    expect(retryDelayMs(1, () => 1)).toBe(2_000);
    expect(retryDelayMs(4, () => 1)).toBe(16_000);
    expect(retryDelayMs(30, () => 1)).toBe(RETRY_POLICY.maxDelayMs);
    expect(retryDelayMs(30, () => 0)).toBe(RETRY_POLICY.maxDelayMs / 2);
  });
});

describe("server answers", () => {
  it("201 and 200 with an attempt are saved; 5xx, 429 and 401 are retried; other refusals are kept as rejected", () => {
    expect(outcomeOf(201, { attempt: {}, created: true }).kind).toBe("saved");
    expect(outcomeOf(200, { attempt: {}, created: false }).kind).toBe("saved");
    expect(outcomeOf(503, {}).kind).toBe("retry");
    expect(outcomeOf(429, {}).kind).toBe("retry");
    expect(outcomeOf(401, { error: "Sign in to continue." })).toEqual({ kind: "retry", error: "Sign in to continue." });
    expect(outcomeOf(413, { error: "too large" })).toEqual({ kind: "rejected", error: "too large" });
    expect(outcomeOf(400, null)).toEqual({ kind: "rejected", error: "the server answered 400" });
    // A 200 without an attempt is not a confirmation (e.g. a captive portal's page).
    expect(outcomeOf(200, "<html>").kind).toBe("rejected");
  });
  it("a failed fetch is a retry, never a loss", async () => {
    const send = fetchSender("/x", async () => {
      throw new TypeError("Failed to fetch");
    });
    const outcome = await send({ captureUid: "u", body: body("u") } as unknown as OutboxEntry);
    expect(outcome).toMatchObject({ kind: "retry", error: expect.stringMatching(/no connection/) });
  });
});

describe("capture outbox", () => {
  it("stores the capture before sending it, and removes it only after the server confirms", async () => {
    const store = memoryStore();
    const seenInStore: boolean[] = [];
    const outbox = new CaptureOutbox({
      store,
      send: async (e) => {
        seenInStore.push((await store.getAll()).some((s) => s.captureUid === e.captureUid));
        return saved(e.captureUid);
      },
    });
    await outbox.enqueue(body("u1"), "PIP flexion");
    await outbox.flush();
    expect(seenInStore).toEqual([true]);
    expect(await store.getAll()).toEqual([]);
  });

  it("keeps a capture through failures, waits out the delay, then sends it once", async () => {
    const c = clock();
    const store = memoryStore();
    let online = false;
    const sent: string[] = [];
    const outbox = new CaptureOutbox({
      store,
      now: c.now,
      random: () => 1,
      send: async (e) => {
        sent.push(e.captureUid);
        return online ? saved(e.captureUid) : { kind: "retry", error: "no connection" };
      },
    });
    await outbox.enqueue(body("u1"), "x");
    await outbox.flush();
    let [entry] = await store.getAll();
    expect(entry).toMatchObject({ tries: 1, state: "pending", lastError: "no connection", nextTryAt: c.now() + 2_000 });

    await outbox.flush();
    expect(sent).toEqual(["u1"]); // not due yet
    c.advance(2_000);
    await outbox.flush();
    [entry] = await store.getAll();
    expect(entry.tries).toBe(2);
    expect(entry.nextTryAt).toBe(c.now() + 4_000);

    online = true;
    await outbox.flush({ force: true });
    expect(sent).toEqual(["u1", "u1", "u1"]);
    expect(await store.getAll()).toEqual([]);
    await outbox.flush({ force: true });
    expect(sent).toHaveLength(3);
  });

  it("a new page over the same store sends what an earlier page left (closed tab)", async () => {
    const store = memoryStore();
    const first = new CaptureOutbox({ store, send: async () => ({ kind: "retry", error: "offline" }) });
    await first.enqueue(body("u1"), "x");
    await first.flush();
    const sent: string[] = [];
    const second = new CaptureOutbox({ store, send: async (e) => (sent.push(e.captureUid), saved(e.captureUid)) });
    await second.flush({ force: true });
    expect(sent).toEqual(["u1"]);
    expect(await store.getAll()).toEqual([]);
  });

  it("sends oldest first and stops at the first connection failure", async () => {
    const c = clock();
    const store = memoryStore();
    const sent: string[] = [];
    const outbox = new CaptureOutbox({ store, now: c.now, send: async (e) => (sent.push(e.captureUid), { kind: "retry", error: "offline" }) });
    for (const uid of ["u1", "u2", "u3"]) {
      await store.put({ captureUid: uid, body: body(uid), label: uid, queuedAt: c.now() - (uid === "u2" ? 100 : 0), tries: 0, nextTryAt: 0, state: "pending", lastError: null });
    }
    await outbox.flush();
    expect(sent).toEqual(["u2"]);
  });

  it("a refused capture is kept, never retried, and can be discarded; a pending one cannot", async () => {
    const store = memoryStore();
    let calls = 0;
    const outbox = new CaptureOutbox({ store, send: async () => (calls++, { kind: "rejected", error: "The capture file is not valid" }) });
    await outbox.enqueue(body("bad"), "x");
    await outbox.flush();
    await outbox.flush({ force: true });
    expect(calls).toBe(1);
    expect((await store.getAll())[0]).toMatchObject({ state: "rejected", lastError: "The capture file is not valid" });
    await outbox.discard("bad");
    expect(await store.getAll()).toEqual([]);

    const pending = new CaptureOutbox({ store, send: async () => ({ kind: "retry", error: "offline" }) });
    await pending.enqueue(body("keep"), "x");
    await pending.flush();
    await expect(pending.discard("keep")).rejects.toThrow(/still being sent/);
  });

  it("overlapping flushes send each capture once", async () => {
    const store = memoryStore();
    const sent: string[] = [];
    let release!: () => void;
    const gate = new Promise<void>((r) => (release = r));
    const outbox = new CaptureOutbox({
      store,
      send: async (e) => {
        sent.push(e.captureUid);
        await gate;
        return saved(e.captureUid);
      },
    });
    await store.put({ captureUid: "u1", body: body("u1"), label: "x", queuedAt: 0, tries: 0, nextTryAt: 0, state: "pending", lastError: null });
    const runs = [outbox.flush(), outbox.flush(), outbox.flush({ force: true })];
    release();
    await Promise.all(runs);
    expect(sent).toEqual(["u1"]);
  });

  it("a send that throws is treated as a failure to retry", async () => {
    const store = memoryStore();
    const outbox = new CaptureOutbox({
      store,
      send: async () => {
        throw new Error("boom");
      },
    });
    await outbox.enqueue(body("u1"), "x");
    await outbox.flush();
    expect((await store.getAll())[0]).toMatchObject({ state: "pending", tries: 1, lastError: "Error: boom" });
  });
});

describe("running in a page", () => {
  it("flushes on start, on the online event, and when the retry timer fires", async () => {
    const store = memoryStore();
    let online = false;
    const sent: string[] = [];
    const outbox = new CaptureOutbox({ store, random: () => 0, send: async (e) => (sent.push(e.captureUid), online ? saved(e.captureUid) : { kind: "retry", error: "offline" }) });
    await store.put({ captureUid: "u1", body: body("u1"), label: "x", queuedAt: 0, tries: 0, nextTryAt: 0, state: "pending", lastError: null });

    const listeners = new Map<string, () => void>();
    const timers: { fn: () => void; ms: number }[] = [];
    const target = {
      addEventListener: (type: string, fn: () => void) => void listeners.set(type, fn),
      removeEventListener: (type: string) => void listeners.delete(type),
      setTimeout: (fn: () => void, ms: number) => timers.push({ fn, ms }),
      clearTimeout: () => undefined,
    } as unknown as Window;
    const stop = runOutbox(outbox, target);
    await new Promise((r) => setTimeout(r, 20));
    expect(sent).toEqual(["u1"]);
    expect(timers.length).toBeGreaterThan(0);
    expect(timers[timers.length - 1].ms).toBeLessThanOrEqual(1_000);

    online = true;
    listeners.get("online")!();
    await new Promise((r) => setTimeout(r, 20));
    expect(sent).toEqual(["u1", "u1"]);
    expect(await store.getAll()).toEqual([]);
    stop();
    expect(listeners.has("online")).toBe(false);
  });
});
