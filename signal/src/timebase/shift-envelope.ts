import type { ImpactEnvelope } from "./impact-signal";

/**
 * An impact envelope as it would be after its sensor's clock is moved: the value at session time T is
 * the old one at T − shift(T), linearly interpolated between bins (the shift is sub-bin precise; a
 * straight-line drift makes it vary along the session). Bins that would need an invalid or missing
 * old bin are invalid. Cheaper than resampling the recording again and re-filtering it, and equal to
 * that up to the interpolation of a 100 Hz magnitude signal.
 */
export function shiftImpactEnvelope(e: ImpactEnvelope, shiftS: (timeS: number) => number): ImpactEnvelope {
  const m = e.envelope.length;
  const envelope = new Float32Array(m);
  const valid = new Uint8Array(m);
  for (let k = 0; k < m; k++) {
    const src = k - shiftS(k / e.rateHz) * e.rateHz;
    const i = Math.floor(src);
    if (i < 0 || i + 1 >= m || !e.valid[i] || !e.valid[i + 1]) continue;
    const w = src - i;
    envelope[k] = e.envelope[i]! * (1 - w) + e.envelope[i + 1]! * w;
    valid[k] = 1;
  }
  return { envelope, valid, rateHz: e.rateHz, factor: e.factor };
}
