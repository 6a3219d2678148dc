import { NUMERIC_FIELDS, type BreathRow } from "../breath";

export interface ResampleOptions {
  /** Grid step, seconds. @default 1 */
  stepS?: number;
  /** Do not interpolate across gaps longer than this (s); grid points inside stay without the field. @default Infinity */
  maxGapS?: number;
}

const FIELDS = [...NUMERIC_FIELDS.filter((f) => f !== "timeS" && f !== "stage"), "vo2MlKgMin"] as const;

/**
 * Resample breaths onto a regular time grid by linear interpolation between the neighbouring breaths
 * that carry each field (1-s linear interpolation is the usual choice: 93.9 % / 92.5 % of studies in
 * the scoping review doi 10.1055/a-2495-5364, confirmed). Grid points run from the first whole step
 * at or after the first breath to the last breath. Phase and stage come from the latest breath at or
 * before each grid point. O(n + grid points). Input rows are not mutated.
 */
export function resampleToGrid(rows: readonly BreathRow[], options: ResampleOptions = {}): BreathRow[] {
  const step = options.stepS ?? 1;
  const maxGap = options.maxGapS ?? Infinity;
  if (!(step > 0)) throw new Error("resampleToGrid requires a positive step");
  if (rows.length === 0) return [];
  const start = Math.ceil(rows[0].timeS / step) * step;
  const end = rows[rows.length - 1].timeS;
  const count = Math.max(0, Math.floor((end - start) / step + 1e-9) + 1);
  const out: BreathRow[] = new Array(count);
  let k = 0;
  for (let g = 0; g < count; g++) {
    const t = start + g * step;
    while (k + 1 < rows.length && rows[k + 1].timeS <= t) k++;
    const row: BreathRow = { timeS: t };
    if (rows[k].phase !== undefined) row.phase = rows[k].phase;
    if (rows[k].stage !== undefined) row.stage = rows[k].stage;
    out[g] = row;
  }
  for (const f of FIELDS) {
    const ts: number[] = [];
    const vs: number[] = [];
    for (const r of rows) {
      const v = r[f];
      if (typeof v === "number" && Number.isFinite(v)) {
        ts.push(r.timeS);
        vs.push(v);
      }
    }
    if (ts.length === 0) continue;
    let j = 0;
    for (let g = 0; g < count; g++) {
      const t = out[g].timeS;
      if (t < ts[0] || t > ts[ts.length - 1]) continue;
      while (j + 1 < ts.length && ts[j + 1] < t) j++;
      let v: number;
      if (ts[j] === t || j + 1 >= ts.length) v = vs[j];
      else if (ts[j + 1] === t) v = vs[j + 1];
      else {
        const dt = ts[j + 1] - ts[j];
        if (dt > maxGap) continue;
        v = dt > 0 ? vs[j] + ((vs[j + 1] - vs[j]) * (t - ts[j])) / dt : vs[j];
      }
      (out[g] as unknown as Record<string, number>)[f] = v;
    }
  }
  return out;
}
