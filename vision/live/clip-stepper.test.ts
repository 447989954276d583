import { describe, expect, it } from "vitest";
import { frameRateFromMediaTimes } from "./clip-stepper";

// WebM keeps frame times on a 1 ms clock by default (Matroska TimecodeScale 1,000,000 ns, matroska.org spec), so a
// 30 fps clip's frames sit at 0, 33, 67, 100 ms...; MP4 keeps a finer timescale (ISO/IEC 14496-12 mdhd timescale).
const webmTimes = (fps: number, n: number, start = 0) => Array.from({ length: n }, (_, i) => Math.round(((start + i) * 1000) / fps) / 1000);

describe("frameRateFromMediaTimes", () => {
  it("reads the usual camera rates from millisecond-rounded frame times", () => {
    for (const fps of [15, 24, 25, 30, 60]) expect(frameRateFromMediaTimes(webmTimes(fps, 12, 7)), `${fps} fps`).toBe(fps);
  });

  it("is not fooled by frames the browser skipped while playing", () => {
    const times = webmTimes(30, 16).filter((_, i) => i !== 4 && i !== 9 && i !== 10);
    expect(frameRateFromMediaTimes(times)).toBe(30);
  });

  it("takes an NTSC rate as the whole rate beside it, and keeps a rate that is no common one as measured", () => {
    // 30000/1001 frames a second (SMPTE ST 12-1 drop-frame rate) is 0.1% from 30.
    const ntsc = Array.from({ length: 12 }, (_, i) => (i * 1001) / 30000);
    expect(frameRateFromMediaTimes(ntsc)).toBe(30);
    expect(frameRateFromMediaTimes(Array.from({ length: 12 }, (_, i) => i / 20.5))).toBe(20.5);
  });

  it("gives no rate from too few frames", () => {
    expect(frameRateFromMediaTimes([0, 0.033])).toBeNull();
    expect(frameRateFromMediaTimes([0, 0, 0, 0])).toBeNull();
  });
});
