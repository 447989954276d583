import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { payments, users, visits } from "@/db/schema";
import { seedDemo, type SeedResult } from "@/db/seed/demo";
import { sendDueReceipts } from "@/lib/payments/receipt";
import { startMailCatcher, type MailCatcher } from "../../scripts/mail-catcher";
import { tempDatabase, type TempDb } from "./support";

// The mail server is down at first (nothing listens on this port), then comes up.
process.env.SMTP_URL = "smtp://127.0.0.1:2656";

let t: TempDb;
let seed: SeedResult;
let mail: MailCatcher | null = null;
let paymentId: string;

beforeAll(async () => {
  t = await tempDatabase();
  seed = await seedDemo(t.db, new Date("2026-12-01T09:00:00Z"));
  const [therapist] = await t.db.select().from(users).where(eq(users.email, "therapist@kinarc.test"));
  const [visit] = await t.db
    .insert(visits)
    .values({ clinicId: seed.clinicId!, clientId: seed.clientIds!.dorian, therapistId: therapist.id, kind: "video", startsAt: new Date("2026-12-03T10:00:00Z"), status: "finished" })
    .returning();
  const [payment] = await t.db
    .insert(payments)
    .values({ clinicId: seed.clinicId!, visitId: visit.id, clientId: seed.clientIds!.dorian, amountMinor: 6500, currency: "gbp", status: "paid", checkoutSessionId: "cs_test_due_1", paymentIntentId: "pi_test_due_1", paidAt: new Date() })
    .returning();
  paymentId = payment.id;
});
afterAll(async () => {
  await mail?.close();
  t?.close();
});

describe("receipts that could not be sent when the payment came in", () => {
  it("stay due while the mail server is down, go out once when it is back, and never twice", async () => {
    expect(await sendDueReceipts(t.db)).toEqual({ sent: 0, failed: 1 });
    expect((await t.db.select().from(payments).where(eq(payments.id, paymentId)))[0].receiptSentAt).toBeNull();

    mail = await startMailCatcher({ smtpPort: 2656, httpPort: 2657, quiet: true });
    expect(await sendDueReceipts(t.db)).toEqual({ sent: 1, failed: 0 });
    expect(await sendDueReceipts(t.db)).toEqual({ sent: 0, failed: 0 });
    const receipts = mail.messages.filter((m) => /receipt/i.test(m.subject));
    expect(receipts).toHaveLength(1);
    expect(receipts[0].text).toContain("Amount: £65.00.");
    expect((await t.db.select().from(payments).where(eq(payments.id, paymentId)))[0].receiptSentAt).not.toBeNull();
  });
});
