import { describe, expect, it } from "vitest";
import { clientInputSchema, clientPatchSchema } from "./client";
import { formDataToObject } from "./common";

const valid = {
  givenName: "Ada",
  familyName: "Quill",
  dateOfBirth: "1984-03-09",
  dominantHand: "right",
  affectedSide: "right",
};

describe("clientInputSchema", () => {
  it("accepts a minimal record and fills defaults", () => {
    const parsed = clientInputSchema.parse(valid);
    expect(parsed.precautionFlags).toEqual([]);
    expect(parsed.sex).toBe("unknown");
    expect(parsed.email).toBeNull();
  });

  it("names each bad field and what was expected", () => {
    const result = clientInputSchema.safeParse({ ...valid, dateOfBirth: "09/03/1984", dominantHand: "both", email: "nope" });
    expect(result.success).toBe(false);
    const byField = Object.fromEntries(result.error!.issues.map((i) => [i.path.join("."), i.message]));
    expect(byField.dateOfBirth).toMatch(/YYYY-MM-DD/);
    expect(byField.dominantHand).toMatch(/left or right/);
    expect(byField.email).toMatch(/e-mail/);
  });

  it("refuses impossible dates and future births", () => {
    expect(clientInputSchema.safeParse({ ...valid, dateOfBirth: "2001-02-30" }).success).toBe(false);
    expect(clientInputSchema.safeParse({ ...valid, dateOfBirth: "2999-01-01" }).success).toBe(false);
  });

  it("requires the no-resisted-testing flag when a date for it is given", () => {
    const r = clientInputSchema.safeParse({ ...valid, noResistedUntil: "2027-01-15" });
    expect(r.success).toBe(false);
    expect(r.error!.issues[0].path).toEqual(["precautionFlags"]);
    const ok = clientInputSchema.parse({ ...valid, noResistedUntil: "2027-01-15", precautionFlags: ["no_resisted_testing"] });
    expect(ok.noResistedUntil).toBe("2027-01-15");
  });

  it("reads the shape a browser form sends", () => {
    const form = new FormData();
    for (const [k, v] of Object.entries(valid)) form.append(k, v);
    form.append("precautionFlags[]", "tendon_repair");
    form.append("precautionFlags[]", "no_resisted_testing");
    form.append("selfPay", "on");
    form.append("noResistedUntil", "");
    const parsed = clientInputSchema.parse(formDataToObject(form));
    expect(parsed.precautionFlags).toEqual(["tendon_repair", "no_resisted_testing"]);
    expect(parsed.selfPay).toBe(true);
    expect(parsed.noResistedUntil).toBeNull();
  });

  it("patch accepts a subset and still checks each field", () => {
    expect(clientPatchSchema.parse({ diagnosisNote: "new note" })).toEqual({ diagnosisNote: "new note" });
    expect(clientPatchSchema.safeParse({ affectedSide: "middle" }).success).toBe(false);
  });
});
