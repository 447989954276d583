/**
 * When reading each frame with both hand models costs too much on this device. Pure.
 *
 * Both models together read peaks as well at 6 frames a second as at 30 on held-out clips (scripts/accuracy/README.md,
 * "Two hand models on one clip": `model-agreement.ts --fps`, an approximation), so accuracy sets no higher floor. The
 * floor is for the person: below it the picture stutters and the count of repetitions lags. Our choice, above the
 * lowest rate checked.
 */
export const MIN_PAIRED_FPS = 8;

/**
 * The rate is judged over this long, so one slow moment (a page busy saving an attempt) does not stop the pairing; the
 * first this-long of pairing, which includes the second model's start-up (hundreds of ms, hand-models notes), is not
 * judged.
 */
export const PAIRED_WINDOW_MS = 3000;

/**
 * True when frames have been read by both models for at least PAIRED_WINDOW_MS and fewer than MIN_PAIRED_FPS a
 * second arrived over the last PAIRED_WINDOW_MS. `frameTimes`: arrival times (ms) of recent frames; older ones are
 * ignored.
 */
export function pairingTooSlow(frameTimes: readonly number[], now: number, pairedSince: number): boolean {
  if (now - pairedSince < PAIRED_WINDOW_MS) return false;
  const recent = frameTimes.filter((t) => now - t < PAIRED_WINDOW_MS).length;
  return recent < (MIN_PAIRED_FPS * PAIRED_WINDOW_MS) / 1000;
}
