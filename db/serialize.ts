import type { Client, Transaction, TransactionMode } from "@libsql/client";

/**
 * libSQL's local (`file:`) driver is synchronous and opens a pool of connections. A transaction that awaits between
 * its statements keeps SQLite's write lock; if another request in this process then writes on a second connection,
 * that write busy-waits on the one thread the first transaction needs to finish, and both fail with SQLITE_BUSY after
 * the busy timeout. SQLite has one writer at a time anyway, so this process takes turns: a transaction holds the turn
 * from begin to commit/rollback/close, and statements outside a transaction wait for the turn.
 * A statement issued on the outer client from inside a transaction would wait for itself: that is a bug in the
 * caller (use the transaction handle), and it fails after `waitMs` with a message that says so.
 */
export function serializeWrites(client: Client, waitMs = 15_000): Client {
  let tail: Promise<void> = Promise.resolve();

  const takeTurn = async (): Promise<() => void> => {
    let release!: () => void;
    const previous = tail;
    const mine = new Promise<void>((resolve) => (release = resolve));
    tail = previous.then(() => mine);
    let timer: ReturnType<typeof setTimeout> | undefined;
    const timeout = new Promise<never>((_, reject) => {
      timer = setTimeout(
        () => reject(new Error(`database turn not granted within ${waitMs} ms (a statement on the outer client inside a transaction?)`)),
        waitMs,
      );
    });
    try {
      await Promise.race([previous, timeout]);
    } catch (error) {
      // Give the turn on at once when it does come, so later callers are not held up by this failed one.
      void previous.then(release);
      throw error;
    } finally {
      clearTimeout(timer);
    }
    return release;
  };

  const inTurn =
    <A extends unknown[], R>(fn: (...args: A) => Promise<R>) =>
    async (...args: A): Promise<R> => {
      const release = await takeTurn();
      try {
        return await fn(...args);
      } finally {
        release();
      }
    };

  const transaction = async (mode?: TransactionMode): Promise<Transaction> => {
    const release = await takeTurn();
    let tx: Transaction;
    try {
      tx = await client.transaction(mode);
    } catch (error) {
      release();
      throw error;
    }
    let done = false;
    const finish = () => {
      if (!done) {
        done = true;
        release();
      }
    };
    return new Proxy(tx, {
      get(target, prop, receiver) {
        const value = Reflect.get(target, prop, receiver);
        if (prop === "commit" || prop === "rollback") {
          return async () => {
            try {
              return await (value as () => Promise<void>).call(target);
            } finally {
              finish();
            }
          };
        }
        if (prop === "close") {
          return () => {
            try {
              (value as () => void).call(target);
            } finally {
              finish();
            }
          };
        }
        return typeof value === "function" ? value.bind(target) : value;
      },
    });
  };

  return new Proxy(client, {
    get(target, prop, receiver) {
      if (prop === "transaction") return transaction;
      const value = Reflect.get(target, prop, receiver);
      if (prop === "execute" || prop === "batch" || prop === "executeMultiple" || prop === "migrate") {
        return inTurn((value as (...a: unknown[]) => Promise<unknown>).bind(target));
      }
      return typeof value === "function" ? value.bind(target) : value;
    },
  });
}
