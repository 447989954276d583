import { describe, expect, it } from "vitest";
import { OneEuroFilter, smoothingFactor } from "./one-euro";
import { SeededRandom } from "./testing/synthetic-hand";

// Checks against Casiez, Roussel & Vogel, "1 Euro Filter", CHI 2012. The paper's definitions, restated here
// independently of the implementation:
//   tau = 1 / (2 pi fc);  alpha = 1 / (1 + tau / Te)                          (smoothing factor of a low-pass)
//   dx_i  = (x_i - xhat_{i-1}) / Te;  dxhat_i = a_d dx_i + (1 - a_d) dxhat_{i-1}, a_d = alpha(Te, dcutoff)
//   fc_i  = mincutoff + beta |dxhat_i|;  xhat_i = a x_i + (1 - a) xhat_{i-1}, a = alpha(Te, fc_i)
//   first sample: xhat_0 = x_0, dxhat_0 = 0.

function paperReference(xs: number[], ts: number[], minCutoff: number, beta: number, dCutoff: number): number[] {
  const alpha = (te: number, fc: number) => 1 / (1 + 1 / (2 * Math.PI * fc) / te);
  const out: number[] = [xs[0]];
  let xhat = xs[0];
  let dxhat = 0;
  for (let i = 1; i < xs.length; i++) {
    const te = ts[i] - ts[i - 1];
    const dx = (xs[i] - xhat) / te;
    dxhat = alpha(te, dCutoff) * dx + (1 - alpha(te, dCutoff)) * dxhat;
    const fc = minCutoff + beta * Math.abs(dxhat);
    xhat = alpha(te, fc) * xs[i] + (1 - alpha(te, fc)) * xhat;
    out.push(xhat);
  }
  return out;
}

describe("One Euro filter (Casiez, Roussel & Vogel, CHI 2012)", () => {
  it("smoothing factor follows alpha = 1 / (1 + tau/Te): at 30 Hz and 1 Hz cutoff it is 0.17317 (worked by hand)", () => {
    // tau = 1/(2 pi) = 0.159155 s; Te = 1/30 s; tau/Te = 4.774648; alpha = 1 / 5.774648 = 0.173171
    expect(smoothingFactor(1 / 30, 1)).toBeCloseTo(0.173171, 6);
  });

  it("matches the paper's formulas sample by sample on a noisy movement with irregular timing", () => {
    const random = new SeededRandom(5);
    const ts: number[] = [];
    const xs: number[] = [];
    let t = 0;
    for (let i = 0; i < 400; i++) {
      t += random.uniform(0.02, 0.05);
      ts.push(t);
      xs.push(60 * Math.sin(t * 1.3) + 4 * random.normal());
    }
    for (const [minCutoff, beta, dCutoff] of [
      [1, 0.007, 1],
      [0.5, 0.1, 1],
      [2, 0, 0.5],
    ]) {
      const filter = new OneEuroFilter({ minCutoffHz: minCutoff, beta, derivativeCutoffHz: dCutoff });
      const ours = xs.map((x, i) => filter.filter(x, ts[i]));
      const reference = paperReference(xs, ts, minCutoff, beta, dCutoff);
      ours.forEach((v, i) => expect(v).toBeCloseTo(reference[i], 9));
    }
  });

  it("with beta = 0 it is a plain exponential smoother: a unit step reaches 1 - (1 - alpha)^n after n samples", () => {
    const filter = new OneEuroFilter({ minCutoffHz: 1, beta: 0, derivativeCutoffHz: 1 });
    filter.filter(0, 0);
    const a = smoothingFactor(1 / 30, 1);
    for (let n = 1; n <= 30; n++) expect(filter.filter(1, n / 30)).toBeCloseTo(1 - (1 - a) ** n, 12);
  });

  it("a larger beta lags less behind a fast ramp (the point of the speed-dependent cutoff)", () => {
    const lagAt = (beta: number) => {
      const filter = new OneEuroFilter({ minCutoffHz: 1, beta, derivativeCutoffHz: 1 });
      let out = 0;
      for (let i = 0; i <= 30; i++) out = filter.filter(100 * (i / 30), i / 30);
      return 100 - out;
    };
    expect(lagAt(0.05)).toBeLessThan(lagAt(0));
  });

  it("a repeated timestamp does not divide by zero; reset starts over from the next sample", () => {
    const filter = new OneEuroFilter();
    filter.filter(10, 1);
    expect(filter.filter(50, 1)).toBe(10);
    filter.reset();
    expect(filter.filter(50, 2)).toBe(50);
  });
});
