import path from "node:path";
import { getDb } from "@/db";
import { sendDueReceipts } from "@/lib/payments/receipt";
import { runVisitJobs } from "@/lib/visits/service";

/**
 * Periodic work: visit reminders (the day before), marking visits that never started as missed, and payment receipts
 * that could not be sent when the payment came in.
 * Production: call `npm run -s jobs` from cron every few minutes, or run `npm run -s jobs -- --every 60` as a service.
 * `npm run demo` runs the same loop in-process.
 */
export async function runJobsOnce(now = new Date()) {
  const db = getDb();
  const visits = await runVisitJobs(db, now);
  const receipts = await sendDueReceipts(db);
  return { ...visits, receiptsSent: receipts.sent, receiptsFailed: receipts.failed };
}

export function startJobLoop(everySeconds: number, log: (line: string) => void = console.log): () => void {
  let running = false;
  const tick = async () => {
    if (running) return;
    running = true;
    try {
      const r = await runJobsOnce();
      if (r.reminded || r.missed || r.receiptsSent || r.receiptsFailed)
        log(`[jobs] ${r.reminded} reminder(s) sent, ${r.missed} visit(s) marked missed, ${r.receiptsSent} receipt(s) sent, ${r.receiptsFailed} receipt(s) still due`);
    } catch (error) {
      log(`[jobs] failed: ${error instanceof Error ? error.message : String(error)}`);
    } finally {
      running = false;
    }
  };
  void tick();
  const timer = setInterval(tick, everySeconds * 1000);
  return () => clearInterval(timer);
}

if (process.argv[1] && path.resolve(process.argv[1]) === path.resolve(__filename)) {
  const i = process.argv.indexOf("--every");
  if (i > 0) {
    const seconds = Number(process.argv[i + 1]);
    if (!Number.isFinite(seconds) || seconds < 10) {
      console.error("--every: expected a number of seconds, 10 or more");
      process.exit(2);
    }
    startJobLoop(seconds);
  } else {
    runJobsOnce()
      .then((r) => console.log(JSON.stringify(r)))
      .catch((error) => {
        console.error(error instanceof Error ? error.message : String(error));
        process.exit(1);
      });
  }
}
