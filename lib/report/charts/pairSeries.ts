/** A value that may be missing (not measured or not determinable). */
export type MaybeNumber = number | null | undefined;

/**
 * Zip two equally indexed arrays into [x, y] pairs, skipping pairs where either value is missing or
 * not finite; `scaleX`/`scaleY` convert units for display (e.g. s → min). Arrays of unequal length
 * are paired up to the shorter one.
 */
export function pairSeries(xs: readonly MaybeNumber[], ys: readonly MaybeNumber[], scaleX = 1, scaleY = 1): [number, number][] {
  const out: [number, number][] = [];
  const n = Math.min(xs.length, ys.length);
  for (let i = 0; i < n; i++) {
    const a = xs[i];
    const b = ys[i];
    if (typeof a === "number" && typeof b === "number" && Number.isFinite(a) && Number.isFinite(b))
      out.push([a * scaleX, b * scaleY]);
  }
  return out;
}
