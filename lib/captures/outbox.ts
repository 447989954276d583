/**
 * The browser's outbox of finished attempts: each capture is written to IndexedDB first, then posted to
 * `POST /api/v1/captures`, and removed only once the server has confirmed it (201, or 200 for one it already had).
 * Failed sends are retried with growing, jittered delays, when the browser comes back online and on every page load,
 * so a dropped connection or a closed tab loses nothing. The server stores a capture id once, so sending twice is safe.
 */
import type { CaptureSaveResponse } from "./upload";

export interface OutboxEntry {
  captureUid: string;
  /** The request body exactly as it will be posted. */
  body: { captureUid: string } & Record<string, unknown>;
  /** Words for the person, e.g. "PIP flexion, right middle finger". */
  label: string;
  queuedAt: number;
  tries: number;
  nextTryAt: number;
  /** `rejected`: the server refused it for a reason a retry will not fix; kept until the person discards it. */
  state: "pending" | "rejected";
  lastError: string | null;
}

export interface OutboxStore {
  getAll(): Promise<OutboxEntry[]>;
  put(entry: OutboxEntry): Promise<void>;
  delete(captureUid: string): Promise<void>;
}

export type SendOutcome = { kind: "saved"; response: CaptureSaveResponse } | { kind: "retry"; error: string } | { kind: "rejected"; error: string };

export type Sender = (entry: OutboxEntry) => Promise<SendOutcome>;

export const RETRY_POLICY = { firstDelayMs: 2_000, maxDelayMs: 5 * 60_000 } as const;

/**
 * Delay before try number `tries + 1`: doubling from 2 s up to 5 minutes, each drawn between half and the whole of
 * that, so many browsers coming back online at once do not all retry together ("Exponential Backoff And Jitter",
 * M. Brooker, AWS Architecture Blog, 2015 [common practice]).
 */
export function retryDelayMs(tries: number, random: () => number = Math.random): number {
  const ceiling = Math.min(RETRY_POLICY.maxDelayMs, RETRY_POLICY.firstDelayMs * 2 ** Math.max(0, tries - 1));
  return ceiling / 2 + (random() * ceiling) / 2;
}

/** How a server answer decides an entry's fate. */
export function outcomeOf(status: number, body: unknown): SendOutcome {
  const message = (body && typeof body === "object" && "error" in body && typeof body.error === "string" ? body.error : null) ?? `the server answered ${status}`;
  if ((status === 200 || status === 201) && body && typeof body === "object" && "attempt" in body) return { kind: "saved", response: body as CaptureSaveResponse };
  // Signed out (401) or a busy or failing server: the same capture may well be accepted later.
  if (status === 401 || status === 408 || status === 429 || status >= 500) return { kind: "retry", error: message };
  return { kind: "rejected", error: message };
}

export function fetchSender(url = "/api/v1/captures", fetchImpl: typeof fetch = (...args) => fetch(...args)): Sender {
  return async (entry) => {
    let response: Response;
    try {
      response = await fetchImpl(url, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify(entry.body), credentials: "same-origin" });
    } catch (error) {
      return { kind: "retry", error: `no connection (${error instanceof Error ? error.message : String(error)})` };
    }
    const body = await response.json().catch(() => null);
    return outcomeOf(response.status, body);
  };
}

export interface OutboxOptions {
  store: OutboxStore;
  send: Sender;
  now?: () => number;
  random?: () => number;
  onSaved?: (entry: OutboxEntry, response: CaptureSaveResponse) => void;
  onChange?: () => void;
}

export class CaptureOutbox {
  private readonly now: () => number;
  private readonly random: () => number;
  private flushing: Promise<void> | null = null;
  private again = false;
  private readonly listeners = new Set<() => void>();
  private readonly savedListeners = new Set<(entry: OutboxEntry, response: CaptureSaveResponse) => void>();

  constructor(private readonly options: OutboxOptions) {
    this.now = options.now ?? Date.now;
    this.random = options.random ?? Math.random;
  }

  /** Keeps the capture in the store, then tries to send it. Resolves once it is stored (not once it is sent). */
  async enqueue(body: OutboxEntry["body"], label: string): Promise<void> {
    const at = this.now();
    await this.options.store.put({ captureUid: body.captureUid, body, label, queuedAt: at, tries: 0, nextTryAt: at, state: "pending", lastError: null });
    this.changed();
    void this.flush();
  }

  /** Called after every change of the stored entries (queued, sent, failed, discarded). */
  subscribe(listener: () => void): () => void {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  }

  /** Called with the server's answer each time a capture is confirmed. */
  onSaved(listener: (entry: OutboxEntry, response: CaptureSaveResponse) => void): () => void {
    this.savedListeners.add(listener);
    return () => this.savedListeners.delete(listener);
  }

  private changed(): void {
    this.options.onChange?.();
    for (const listener of this.listeners) listener();
  }

  entries(): Promise<OutboxEntry[]> {
    return this.options.store.getAll();
  }

  /**
   * Sends every pending entry that is due (all of them with `force`, e.g. on coming back online), one at a time.
   * Calls while a flush runs join it and make it look once more, so nothing queued meanwhile waits for the next timer.
   */
  flush(options: { force?: boolean } = {}): Promise<void> {
    if (this.flushing) {
      this.again = true;
      if (options.force) this.forceNext = true;
      return this.flushing;
    }
    this.forceNext = options.force ?? false;
    this.flushing = (async () => {
      try {
        do {
          this.again = false;
          const force = this.forceNext;
          this.forceNext = false;
          await this.sendDue(force);
        } while (this.again);
      } finally {
        this.flushing = null;
      }
    })();
    return this.flushing;
  }
  private forceNext = false;

  private async sendDue(force: boolean): Promise<void> {
    const due = (await this.options.store.getAll())
      .filter((e) => e.state === "pending" && (force || e.nextTryAt <= this.now()))
      .sort((a, b) => a.queuedAt - b.queuedAt);
    for (const entry of due) {
      const outcome = await this.options.send(entry).catch((error: unknown): SendOutcome => ({ kind: "retry", error: String(error) }));
      if (outcome.kind === "saved") {
        await this.options.store.delete(entry.captureUid);
        this.options.onSaved?.(entry, outcome.response);
        for (const listener of this.savedListeners) listener(entry, outcome.response);
      } else {
        const tries = entry.tries + 1;
        await this.options.store.put({
          ...entry,
          tries,
          lastError: outcome.error,
          state: outcome.kind === "rejected" ? "rejected" : "pending",
          nextTryAt: this.now() + retryDelayMs(tries, this.random),
        });
      }
      this.changed();
      // Offline: the rest would fail the same way; they wait for the next timer or the online event.
      if (outcome.kind === "retry") break;
    }
  }

  /** When the earliest pending entry is due, or null when nothing waits. */
  async nextDueAt(): Promise<number | null> {
    const pending = (await this.options.store.getAll()).filter((e) => e.state === "pending");
    return pending.length ? Math.min(...pending.map((e) => e.nextTryAt)) : null;
  }

  /** Removes an entry the server refused, once the person has seen why. Pending entries are never discarded. */
  async discard(captureUid: string): Promise<void> {
    const entry = (await this.options.store.getAll()).find((e) => e.captureUid === captureUid);
    if (!entry) return;
    if (entry.state !== "rejected") throw new Error(`${captureUid}: only an attempt the server refused can be discarded; this one is still being sent`);
    await this.options.store.delete(captureUid);
    this.changed();
  }
}

export function memoryStore(initial: OutboxEntry[] = []): OutboxStore {
  const entries = new Map(initial.map((e) => [e.captureUid, structuredClone(e)]));
  return {
    getAll: async () => [...entries.values()].map((e) => structuredClone(e)),
    put: async (entry) => void entries.set(entry.captureUid, structuredClone(entry)),
    delete: async (uid) => void entries.delete(uid),
  };
}

const DB_NAME = "kinarc";
const DB_VERSION = 1;
const STORE_NAME = "capture-outbox";

function request<T>(req: IDBRequest<T>): Promise<T> {
  return new Promise((resolve, reject) => {
    req.onsuccess = () => resolve(req.result);
    req.onerror = () => reject(req.error ?? new Error("IndexedDB request failed"));
  });
}

/** The outbox in IndexedDB (survives closing the tab). */
export function indexedDbStore(factory: IDBFactory = indexedDB): OutboxStore {
  let opened: Promise<IDBDatabase> | null = null;
  const open = () =>
    (opened ??= new Promise<IDBDatabase>((resolve, reject) => {
      const req = factory.open(DB_NAME, DB_VERSION);
      req.onupgradeneeded = () => {
        if (!req.result.objectStoreNames.contains(STORE_NAME)) req.result.createObjectStore(STORE_NAME, { keyPath: "captureUid" });
      };
      req.onsuccess = () => resolve(req.result);
      req.onerror = () => {
        opened = null;
        reject(req.error ?? new Error("IndexedDB could not be opened"));
      };
    }));
  const withStore = async <T>(mode: IDBTransactionMode, run: (store: IDBObjectStore) => IDBRequest<T>): Promise<T> => {
    const db = await open();
    const tx = db.transaction(STORE_NAME, mode);
    const result = request(run(tx.objectStore(STORE_NAME)));
    // A write counts only once its transaction has committed.
    await new Promise<void>((resolve, reject) => {
      tx.oncomplete = () => resolve();
      tx.onerror = () => reject(tx.error ?? new Error("IndexedDB transaction failed"));
      tx.onabort = () => reject(tx.error ?? new Error("IndexedDB transaction aborted"));
    });
    return result;
  };
  return {
    getAll: () => withStore("readonly", (s) => s.getAll() as IDBRequest<OutboxEntry[]>),
    put: async (entry) => void (await withStore("readwrite", (s) => s.put(entry))),
    delete: async (uid) => void (await withStore("readwrite", (s) => s.delete(uid))),
  };
}

/**
 * Runs an outbox in a page: flushes now (page load), on every `online` event, and when the next retry is due.
 * Returns a function that stops it.
 */
export function runOutbox(outbox: CaptureOutbox, target: Pick<Window, "addEventListener" | "removeEventListener" | "setTimeout" | "clearTimeout"> = window): () => void {
  let timer: number | null = null;
  let stopped = false;
  const schedule = async () => {
    if (stopped) return;
    if (timer !== null) target.clearTimeout(timer);
    timer = null;
    const due = await outbox.nextDueAt();
    if (due === null || stopped) return;
    timer = target.setTimeout(() => void outbox.flush().then(schedule), Math.max(0, due - Date.now()));
  };
  const onOnline = () => void outbox.flush({ force: true }).then(schedule);
  target.addEventListener("online", onOnline);
  const unsubscribe = outbox.subscribe(() => void schedule());
  void outbox.flush().then(schedule);
  return () => {
    stopped = true;
    unsubscribe();
    target.removeEventListener("online", onOnline);
    if (timer !== null) target.clearTimeout(timer);
  };
}

let shared: CaptureOutbox | null = null;

/** The page's one outbox over IndexedDB, posting to the app's own API. Browser only. */
export function browserOutbox(): CaptureOutbox {
  shared ??= new CaptureOutbox({ store: indexedDbStore(), send: fetchSender() });
  return shared;
}
