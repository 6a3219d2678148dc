/** Index of the first value strictly above `level` in ascending `values` (values.length when none): binary search. */
export function firstIndexAbove(values: ArrayLike<number>, level: number): number {
  let lo = 0;
  let hi = values.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (values[mid] > level) hi = mid;
    else lo = mid + 1;
  }
  return lo;
}
