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

/**
 * `firstIndexAbove` for a run of levels: each call walks on from the last answer when the level did not fall (O(1)
 * amortised over ascending candidate breaks), and searches again when it did. Same answers as `firstIndexAbove`.
 */
export function indexAboveWalker(values: ArrayLike<number>): (level: number) => number {
  let k = 0;
  let last = -Infinity;
  return (level: number): number => {
    if (level >= last) while (k < values.length && !(values[k] > level)) k++;
    else k = firstIndexAbove(values, level);
    last = level;
    return k;
  };
}
