import type { ConditionedTest } from "../signal";

/**
 * Typical stage length of a stepped protocol, s: the median time between load changes (work rate, or treadmill speed
 * or grade) inside the incremental phase, when that is at least `minStageS`; null on a ramp (loads change every breath
 * or every few seconds), without a load signal, or with fewer than three changes. A change is a rise of more than
 * 1 % of the phase's top load (so whole-watt rounding on a ramp reads as a ramp). The 1 % and the 45-s default are our
 * choice (they find every stepped protocol of the four synthetic models and no ramp, README-thresholds.md round 8);
 * reading stages from the load is common practice. O(n).
 */
export function stageLengthS(test: ConditionedTest, minStageS = 45): number | null {
  const ex = test.exercise;
  if (!ex) return null;
  const rows = test.clean.filter((r) => r.timeS >= ex.startS && r.timeS <= ex.endS);
  const loadOf = (r: (typeof rows)[number]): number | null =>
    r.workW !== undefined
      ? r.workW
      : r.speedKmh !== undefined || r.gradePct !== undefined
        ? (r.speedKmh ?? 0) * (1 + (r.gradePct ?? 0) / 10) // any rise in speed or grade counts as a load change
        : null;
  const loads = rows.map(loadOf);
  const top = Math.max(0, ...loads.map((v) => v ?? 0));
  if (!(top > 0)) return null;
  const changes: number[] = [];
  let last: number | null = null;
  for (let i = 0; i < rows.length; i++) {
    const v = loads[i];
    if (v === null) continue;
    if (last !== null && v - last > 0.01 * top) changes.push(rows[i].timeS);
    if (last === null || Math.abs(v - last) > 0.01 * top) last = v;
  }
  if (changes.length < 3) return null;
  const gaps = changes.slice(1).map((t, i) => t - changes[i]);
  gaps.sort((a, b) => a - b);
  const median = gaps[Math.floor(gaps.length / 2)];
  return median >= minStageS ? median : null;
}
