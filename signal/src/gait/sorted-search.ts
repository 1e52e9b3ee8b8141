/**
 * First index of the ascending `sorted` whose value is > t (sorted.length when none): NumPy's
 * `searchsorted(sorted, t, side="right")`. One binary search for the stride table and the PCI,
 * which both look up events inside a stride.
 */
export function firstIndexAbove(sorted: ArrayLike<number>, t: number): number {
  let lo = 0;
  let hi = sorted.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (sorted[mid]! > t) hi = mid;
    else lo = mid + 1;
  }
  return lo;
}
