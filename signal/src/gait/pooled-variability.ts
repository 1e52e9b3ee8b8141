export interface PooledCv {
  cvPct: number | null;
  /** Values behind the CV (bouts with ≥ 2 values; single values are left out of both terms). */
  count: number;
}

/**
 * CV across walking bouts without the between-bout pace difference: the pooled within-bout SD
 * s_p = √(Σ(n_b − 1)·s_b² / Σ(n_b − 1)) (the pooled standard deviation of the NIST/SEMATECH
 * e-Handbook of Statistical Methods) over the grand mean of all values, as a
 * percentage. With one bout this is the ordinary CV with ddof 1. A bout with a single value has
 * no within-bout spread (n_b − 1 = 0) and is left out of the mean as well, so SD and mean describe
 * the same strides.
 */
export function pooledWithinBoutCvPct(bouts: readonly (readonly number[])[]): PooledCv {
  let ss = 0;
  let dof = 0;
  let sum = 0;
  let n = 0;
  for (const b of bouts) {
    if (b.length < 2) continue;
    let m = 0;
    for (let i = 0; i < b.length; i++) m += (b[i]! - m) / (i + 1);
    for (const v of b) ss += (v - m) ** 2;
    dof += b.length - 1;
    sum += m * b.length;
    n += b.length;
  }
  if (dof === 0 || n === 0) return { cvPct: null, count: n };
  const grand = sum / n;
  if (!(grand > 0)) return { cvPct: null, count: n };
  return { cvPct: (100 * Math.sqrt(ss / dof)) / grand, count: n };
}
