/**
 * Min/max decimation for plotting: the window [fromS, toS] is split into buckets and each bucket
 * contributes its minimum and maximum sample (in time order), so peaks — the mid-swing peaks the
 * clinician looks for — survive any zoom level. With `maxPoints` ≥ the number of samples in the
 * window the samples are returned unchanged.
 *
 * Samples are on a uniform grid: sample i is at startS + i / sampleRateHz.
 */
export interface DecimatedTrace {
  timeS: number[];
  value: number[];
}

export function minMaxDecimate(
  samples: Float32Array,
  sampleRateHz: number,
  startS: number,
  fromS: number,
  toS: number,
  maxPoints: number,
): DecimatedTrace {
  if (!(sampleRateHz > 0)) throw new RangeError(`sampleRateHz must be positive, got ${sampleRateHz}`);
  if (!Number.isInteger(maxPoints) || maxPoints < 2) throw new RangeError(`maxPoints must be an integer ≥ 2, got ${maxPoints}`);
  const first = Math.max(0, Math.ceil((fromS - startS) * sampleRateHz - 1e-9));
  const last = Math.min(samples.length - 1, Math.floor((toS - startS) * sampleRateHz + 1e-9));
  const out: DecimatedTrace = { timeS: [], value: [] };
  if (last < first) return out;
  const count = last - first + 1;
  const at = (i: number) => startS + i / sampleRateHz;
  const push = (i: number) => {
    const v = samples[i];
    if (v === undefined || Number.isNaN(v)) return;
    out.timeS.push(at(i));
    out.value.push(v);
  };
  if (count <= maxPoints) {
    for (let i = first; i <= last; i++) push(i);
    return out;
  }
  const buckets = Math.floor(maxPoints / 2);
  for (let b = 0; b < buckets; b++) {
    const lo = first + Math.floor((b * count) / buckets);
    const hi = first + Math.floor(((b + 1) * count) / buckets) - 1;
    let iMin = -1;
    let iMax = -1;
    for (let i = lo; i <= hi; i++) {
      const v = samples[i]!;
      if (Number.isNaN(v)) continue;
      if (iMin < 0 || v < samples[iMin]!) iMin = i;
      if (iMax < 0 || v > samples[iMax]!) iMax = i;
    }
    if (iMin < 0) continue;
    if (iMin === iMax) push(iMin);
    else if (iMin < iMax) {
      push(iMin);
      push(iMax);
    } else {
      push(iMax);
      push(iMin);
    }
  }
  return out;
}
