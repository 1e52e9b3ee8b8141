// Binary searches over an ascending array, as NumPy's `searchsorted`: the stride table and the
// PCI both count the events of one leg that fall inside a stride of the other.

/** First index ≥ from of the ascending `sorted` whose value is > t (sorted.length when none): `searchsorted(sorted, t, side="right")`. */
export function firstIndexAbove(sorted: ArrayLike<number>, t: number, from = 0): number {
  let lo = from;
  let hi = sorted.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (sorted[mid]! > t) hi = mid;
    else lo = mid + 1;
  }
  return lo;
}

/** First index ≥ from of the ascending `sorted` whose value is ≥ t (sorted.length when none): `searchsorted(sorted, t, side="left")`. */
export function firstIndexAtOrAbove(sorted: ArrayLike<number>, t: number, from = 0): number {
  let lo = from;
  let hi = sorted.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (sorted[mid]! >= t) hi = mid;
    else lo = mid + 1;
  }
  return lo;
}
