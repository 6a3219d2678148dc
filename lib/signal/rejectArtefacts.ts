import { makeIssue, type Issue } from "../core";
import { isolatedBreaths, type BreathRow, type NumericField } from "../breath";
import { formatClock } from "../units";
import type { ArtefactRule, RemovedBreath, SetAsideSpan } from "./types";

/** Default artefact rule: 4 SD from the local mean of 5 breaths on each side, on VO2, VCO2 and VE. */
export const DEFAULT_ARTEFACT_RULE: ArtefactRule = {
  k: 4,
  halfWindow: 5,
  fields: ["vo2MlMin", "vco2MlMin", "veLMin"],
  centre: "mean",
  enabled: true,
};

/** The values a reviewer's span sets aside: gas exchange and ventilation (not time, HR, SpO2, load or markers). */
const GAS_FIELDS = ["vo2MlMin", "vco2MlMin", "veLMin", "vo2MlKgMin", "rrBrMin", "vtL", "peto2MmHg", "petco2MmHg"] as const;
/** The values a heart-rate span sets aside. */
const HR_FIELDS = ["hrBpm"] as const;

/** Default RER screen: breaths with RER below 0.5 or above 2 are set aside (common practice). */
export const DEFAULT_RER_LIMITS = { min: 0.5, max: 2 } as const;

export interface ArtefactOptions {
  rule?: Partial<ArtefactRule>;
  /** @default { min: 0.5, max: 2 } */
  rer?: { min: number; max: number };
  /** Stage tables: only the RER and impossible-value screens apply. @default false */
  stageRows?: boolean;
  /** Spans a reviewer set aside: their channel's values (gas, or heart rate) are removed first, rows kept. @default [] */
  setAside?: readonly SetAsideSpan[];
}

export interface ArtefactResult {
  clean: BreathRow[];
  removed: RemovedBreath[];
  issues: Issue[];
}

const LABEL: Partial<Record<NumericField, [string, string]>> = {
  vo2MlMin: ["VO2", "mL/min"],
  vco2MlMin: ["VCO2", "mL/min"],
  veLMin: ["VE", "L/min"],
  hrBpm: ["HR", "/min"],
  vtL: ["VT", "L"],
  rrBrMin: ["RR", "/min"],
  petco2MmHg: ["PETCO2", "mmHg"],
  peto2MmHg: ["PETO2", "mmHg"],
};
const label = (f: NumericField) => LABEL[f]?.[0] ?? f;
const unit = (f: NumericField) => LABEL[f]?.[1] ?? "";
const round = (x: number) => (Math.abs(x) >= 100 ? x.toFixed(0) : x.toFixed(2));

/**
 * Artefact-breath rejection, in two steps:
 * 1. Screens (common practice): a breath with VO2, VCO2 or VE ≤ 0, or with RER = VCO2/VO2 outside
 *    [0.5, 2], is set aside.
 * 2. Local deviation: a breath whose value of a checked field lies more than k SD (default 4; 3 is the
 *    other common choice) from the mean (or median) of the `halfWindow` breaths on each side, excluding
 *    itself, is set aside. Near the ends the window shifts inward to keep 2·halfWindow neighbours.
 *    This is convention, counted by a scoping review of breath-by-breath studies (doi
 *    10.1055/a-2495-5364, confirmed: ±4 SD in 51.6 % and ±3 SD in 39.1 % of the studies that describe
 *    outlier removal). Lamarra et al. 1987 (J Appl Physiol; abstract confirmed) characterised breath
 *    noise as uncorrelated Gaussian but did not propose the rule. Caution: Liang, Pandit & Robbins 1996
 *    (J Appl Physiol 81:2274, confirmed) found breath-to-breath ventilation autocorrelated, which the
 *    mean ± k·SD window ignores; two artefacts within one window can mask each other.
 * One pass, O(n·halfWindow) (O(n) with the mean). Every removed breath is recorded with its reason.
 * Input rows are not mutated.
 *
 * @param rows breaths in time order (canonical units)
 */
export function rejectArtefacts(rows: readonly BreathRow[], options: ArtefactOptions = {}): ArtefactResult {
  const rule: ArtefactRule = { ...DEFAULT_ARTEFACT_RULE, ...options.rule };
  const rer = options.rer ?? DEFAULT_RER_LIMITS;
  const issues: Issue[] = [];
  const removedAt = new Map<number, RemovedBreath>();
  // 0. spans set aside by a reviewer (a leak, a run of coughs, a pause): their gas and ventilation values are removed
  // before any rule looks at them; time, heart rate, SpO2, load and phase markers stay (a leak does not change the ECG
  // or the ergometer), so the phases, the end of exercise and peak HR and work rate are found as before
  const byReview: RemovedBreath[] = [];
  const spans = options.setAside ?? [];
  const working: BreathRow[] = rows.slice();
  for (const span of spans) {
    const heart = span.channel === "heart-rate";
    const fields: readonly (keyof BreathRow)[] = heart ? HR_FIELDS : GAS_FIELDS;
    let count = 0;
    let already = 0;
    working.forEach((r, index) => {
      if (r.timeS < span.startS || r.timeS > span.endS) return;
      const present = fields.filter((f) => typeof r[f] === "number");
      if (present.length === 0) {
        if (fields.some((f) => typeof rows[index][f] === "number")) already++; // stripped by an earlier span
        return;
      }
      const field = (present.find((f) => f !== "vo2MlKgMin") ?? "vo2MlMin") as NumericField;
      byReview.push({
        index,
        timeS: r.timeS,
        sourceRow: r.sourceRow,
        field,
        value: typeof r[field] === "number" ? (r[field] as number) : NaN,
        reason: `set aside by review (${formatClock(span.startS)}–${formatClock(span.endS)}): ${span.reason}`,
        byReview: true,
      });
      const kept: BreathRow = { ...r };
      for (const f of fields) delete kept[f];
      working[index] = kept;
      count++;
    });
    const more = already > 0 ? ` (${already} more already set aside by an earlier span)` : "";
    const unit = options.stageRows || heart ? "row(s)" : "breath(s)";
    const what = heart ? "heart rate" : "gas and ventilation values";
    const keptWords = heart ? "The gas values and the load there are kept." : "Heart rate, SpO2 and the load there are kept.";
    issues.push(
      makeIssue(
        count > 0 ? "info" : "warning",
        "breaths-set-aside-by-review",
        count > 0
          ? `The ${what} of ${count} ${unit} from ${formatClock(span.startS)} to ${formatClock(span.endS)} were set aside by review${more}: ${span.reason}. ${keptWords}`
          : already > 0
            ? `The span ${formatClock(span.startS)} to ${formatClock(span.endS)} lies within spans already set aside: nothing more was set aside.`
            : `The span set aside by review, ${formatClock(span.startS)} to ${formatClock(span.endS)}, holds no ${heart ? "heart rate" : "rows"}: nothing was set aside there.`,
        { timeS: span.startS },
      ),
    );
  }
  // 1. screens
  let rerCount = 0;
  let impossible = 0;
  working.forEach((r, index) => {
    if (removedAt.has(index)) return;
    for (const f of ["vo2MlMin", "vco2MlMin", "veLMin"] as const) {
      const v = r[f];
      if (v !== undefined && !(v > 0)) {
        removedAt.set(index, {
          index,
          timeS: r.timeS,
          sourceRow: r.sourceRow,
          field: f,
          value: v,
          reason: `${label(f)} ${round(v)} ${unit(f)} is not physiologically possible`,
        });
        impossible++;
        return;
      }
    }
    if (r.vo2MlMin !== undefined && r.vco2MlMin !== undefined) {
      const q = r.vco2MlMin / r.vo2MlMin;
      if (q < rer.min || q > rer.max) {
        removedAt.set(index, {
          index,
          timeS: r.timeS,
          sourceRow: r.sourceRow,
          field: "vco2MlMin",
          value: r.vco2MlMin,
          reason: `RER ${q.toFixed(2)} is ${q > rer.max ? "above" : "below"} ${q > rer.max ? rer.max : rer.min} (screen for implausible breaths, common practice)`,
        });
        rerCount++;
      }
    }
  });
  if (impossible > 0)
    issues.push(
      makeIssue(
        "warning",
        "impossible-breaths-removed",
        `${impossible} breath(s) with zero or negative VO2, VCO2 or VE were set aside.`,
      ),
    );
  if (rerCount > 0) {
    // a few isolated breaths (a swallow, a cough, a sigh) are an info line; more, or any stage row, a warning
    const limits = rer.max >= 2 ? `above ${rer.max} or below ${rer.min}` : `outside ${rer.min}–${rer.max}`;
    const isolated = !options.stageRows && isolatedBreaths(rerCount, rows.length);
    issues.push(
      isolated
        ? makeIssue(
            "info",
            "rer-out-of-range",
            `${rerCount} isolated breath(s) with RER ${limits} (swallows, coughs or sighs) were set aside.`,
          )
        : makeIssue(
            "warning",
            "rer-out-of-range",
            `${rerCount} ${options.stageRows ? "stage row(s)" : "breath(s)"} with RER ${limits} were set aside (${((100 * rerCount) / Math.max(1, rows.length)).toFixed(1)} % of ${options.stageRows ? "rows" : "breaths"}): check the gas analysers and the mask.`,
          ),
    );
  }
  // 2. local deviation
  if (rule.enabled && !options.stageRows) {
    const flagged = new Map<number, { field: NumericField; value: number; z: number; centre: number }[]>();
    for (const field of rule.fields) {
      const idx: number[] = [];
      const v: number[] = [];
      working.forEach((r, i) => {
        const x = r[field];
        if (typeof x === "number" && Number.isFinite(x) && !removedAt.has(i)) {
          idx.push(i);
          v.push(x);
        }
      });
      const h = rule.halfWindow;
      const m = v.length;
      if (m < 2 * h + 1) {
        if (m > 0)
          issues.push(
            makeIssue(
              "info",
              "artefact-window-too-short",
              `Only ${m} breaths carry ${label(field)}; the local-deviation rule needs at least ${2 * h + 1} and was not applied to it.`,
            ),
          );
        continue;
      }
      const s1 = new Float64Array(m + 1);
      const s2 = new Float64Array(m + 1);
      for (let i = 0; i < m; i++) {
        s1[i + 1] = s1[i] + v[i];
        s2[i + 1] = s2[i] + v[i] * v[i];
      }
      const buf: number[] = [];
      for (let i = 0; i < m; i++) {
        let lo = i - h;
        let hi = i + h;
        if (lo < 0) {
          hi -= lo;
          lo = 0;
        }
        if (hi > m - 1) {
          lo -= hi - (m - 1);
          hi = m - 1;
        }
        const count = hi - lo; // neighbours, self excluded
        const sum = s1[hi + 1] - s1[lo] - v[i];
        const sumSq = s2[hi + 1] - s2[lo] - v[i] * v[i];
        const mean = sum / count;
        const sd = Math.sqrt(Math.max(0, (sumSq - (sum * sum) / count) / (count - 1)));
        let centre = mean;
        if (rule.centre === "median") {
          buf.length = 0;
          for (let j = lo; j <= hi; j++) if (j !== i) buf.push(v[j]);
          buf.sort((a, b) => a - b);
          centre = buf.length % 2 ? buf[(buf.length - 1) / 2] : (buf[buf.length / 2 - 1] + buf[buf.length / 2]) / 2;
        }
        const dev = Math.abs(v[i] - centre);
        const floor = 1e-9 * Math.abs(centre);
        if (dev > rule.k * Math.max(sd, floor) && dev > floor) {
          const hit = { field, value: v[i], z: sd > 0 ? dev / sd : Infinity, centre };
          const hits = flagged.get(idx[i]);
          if (hits) hits.push(hit);
          else flagged.set(idx[i], [hit]);
        }
      }
    }
    for (const [index, hits] of [...flagged.entries()].sort((a, b) => a[0] - b[0])) {
      const r = working[index];
      const f = hits.reduce((a, b) => (b.z > a.z ? b : a));
      const others = hits.filter((x) => x !== f).map((x) => label(x.field));
      const zText = Number.isFinite(f.z) ? `${f.z.toFixed(1)} SD` : "far";
      const also = others.length > 0 ? ` (also ${others.join(", ")})` : "";
      removedAt.set(index, {
        index,
        timeS: r.timeS,
        sourceRow: r.sourceRow,
        field: f.field,
        value: f.value,
        reason: `${label(f.field)} ${round(f.value)} ${unit(f.field)} lies ${zText} from the local ${rule.centre} ${round(f.centre)} of the ${2 * rule.halfWindow} surrounding breaths (limit ${rule.k} SD)${also}`,
      });
    }
    if (flagged.size > 0) {
      issues.push(
        makeIssue(
          "info",
          "artefact-breaths-removed",
          `${flagged.size} breath(s) lying more than ${rule.k} SD from their ${2 * rule.halfWindow} neighbours were set aside as artefacts.`,
        ),
      );
    }
  }
  const removed = [...byReview, ...removedAt.values()].sort((a, b) => a.index - b.index);
  const clean = working.filter((_, i) => !removedAt.has(i));
  return { clean, removed, issues };
}

/**
 * The share of the exercise phase covered by set-aside spans taken together (overlaps counted once), 0–1. Entry points
 * refuse spans that would set aside more than half (our choice: a test to repeat, not one to read without its exercise).
 */
export function exerciseShareSetAside(
  spans: readonly { startS: number; endS: number }[],
  exercise: { startS: number; endS: number },
): number {
  const parts = spans
    .map((s) => [Math.max(s.startS, exercise.startS), Math.min(s.endS, exercise.endS)] as const)
    .filter(([a, b]) => b > a)
    .sort((x, y) => x[0] - y[0]);
  let covered = 0;
  let reach = -Infinity;
  for (const [a, b] of parts) {
    if (b <= reach) continue;
    covered += b - Math.max(a, reach);
    reach = b;
  }
  const length = exercise.endS - exercise.startS;
  return length > 0 ? covered / length : 0;
}
