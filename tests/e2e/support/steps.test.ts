import { describe, expect, it } from "vitest";
import { StepClock, StepTimeoutError } from "./steps";

const wait = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

describe("StepClock", () => {
  it("returns each step's value and records how long it took", async () => {
    const clock = new StepClock(1_000);
    expect(await clock.run("first", 200, async () => 7)).toBe(7);
    await clock.run("second", 200, () => wait(20));
    expect(clock.finished.map((s) => s.name)).toEqual(["first", "second"]);
    expect(clock.finished[1].ms).toBeGreaterThanOrEqual(15);
  });

  it("a step past its deadline fails naming itself and the earlier steps", async () => {
    const clock = new StepClock(1_000);
    await clock.run("sign in", 200, async () => undefined);
    const error = await clock.run("wait for the summary", 30, () => wait(500)).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(StepTimeoutError);
    expect((error as Error).message).toMatch(/^step "wait for the summary" did not finish within 0\.0 s \(earlier steps: sign in 0\.\d s\)$/);
  });

  it("a step's own failure passes through unchanged", async () => {
    const clock = new StepClock(1_000);
    await expect(clock.run("save", 100, async () => { throw new Error("409 from the server"); })).rejects.toThrow("409 from the server");
  });

  it("refuses deadlines that add up past the test's budget", async () => {
    const clock = new StepClock(300);
    await clock.run("a", 200, async () => undefined);
    await expect(clock.run("b", 150, async () => undefined)).rejects.toThrow(/step "b": its 150 ms deadline would pass the test's budget of 300 ms/);
  });
});
