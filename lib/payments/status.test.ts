import { describe, expect, it } from "vitest";
import { formatMoney, visitPaymentState } from "./status";

describe("visitPaymentState", () => {
  it("is paid when any payment for the visit is paid, whatever came later", () => {
    expect(visitPaymentState([{ status: "expired" }, { status: "paid" }])).toBe("paid");
  });
  it("follows the latest payment otherwise, an expired checkout counting as not paid", () => {
    expect(visitPaymentState([])).toBe("unpaid");
    expect(visitPaymentState([{ status: "expired" }])).toBe("unpaid");
    expect(visitPaymentState([{ status: "pending" }, { status: "expired" }])).toBe("pending");
    expect(visitPaymentState([{ status: "refunded" }])).toBe("refunded");
  });
});

describe("formatMoney", () => {
  it("reads minor units as the currency's two-decimal amount (ISO 4217 minor unit 2 for GBP, EUR, USD)", () => {
    expect(formatMoney(6550, "gbp")).toBe("£65.50");
    expect(formatMoney(100, "usd")).toBe("US$1.00");
    expect(formatMoney(123456, "eur")).toBe("€1,234.56");
  });
});
