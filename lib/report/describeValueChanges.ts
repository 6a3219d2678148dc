import { displayUnit } from "../units";
import type { ReportRow, ReportScheme } from "./reportModel";

const withUnit = (value: string, unit: string) => {
  const u = displayUnit(unit);
  return u && value !== "not determinable" ? `${value} ${u}` : value;
};

/**
 * The reported values that differ between two versions of the report's value tables, matched by
 * row label, as plain sentences: "VT1 (AT): 890 mL/min → 1100 mL/min, 41 % of peak VO2 → 50 % of
 * peak VO2, HR 101 bpm → 112 bpm", "Peak VO2: % predicted 66 → 70". Value, predicted, % predicted,
 * LLN and the values read at a threshold are compared. Values are compared as displayed (already rounded), so a change too small to show is not
 * listed. A row present in only one version is listed as added or no longer reported.
 *
 * @param before rows of the earlier version (key values and thresholds)
 * @param after rows of the current version
 * @returns one sentence per changed row, in the order of `after` (then rows that disappeared)
 */
export function describeValueChanges(before: readonly ReportRow[], after: readonly ReportRow[]): string[] {
  const old = new Map(before.map((r) => [r.label, r]));
  const out: string[] = [];
  for (const r of after) {
    const b = old.get(r.label);
    if (!b) {
      out.push(`${r.label}: newly reported, ${withUnit(r.value, r.unit)}`);
      continue;
    }
    const bits: string[] = [];
    if (b.value !== r.value || b.unit !== r.unit) bits.push(`${withUnit(b.value, b.unit)} → ${withUnit(r.value, r.unit)}`);
    if ((b.pctPredicted ?? "") !== (r.pctPredicted ?? ""))
      bits.push(`% predicted ${b.pctPredicted ?? "none"} → ${r.pctPredicted ?? "none"}`);
    if ((b.predicted ?? "") !== (r.predicted ?? ""))
      bits.push(`predicted ${withUnit(b.predicted ?? "none", b.unit)} → ${withUnit(r.predicted ?? "none", r.unit)}`);
    if ((b.lln ?? "") !== (r.lln ?? ""))
      bits.push(`LLN ${withUnit(b.lln ?? "none", b.unit)} → ${withUnit(r.lln ?? "none", r.unit)}`);
    const oldAt = new Map((b.atValues ?? []).map((a) => [a.label, a.value]));
    const newAt = new Map((r.atValues ?? []).map((a) => [a.label, a.value]));
    for (const label of new Set([...oldAt.keys(), ...newAt.keys()])) {
      const was = oldAt.get(label);
      const now = newAt.get(label);
      if (was !== now) bits.push(`${was ?? `${label} none`} → ${now ?? `${label} none`}`);
    }
    if (bits.length) out.push(`${r.label}: ${bits.join(", ")}`);
  }
  const now = new Set(after.map((r) => r.label));
  for (const b of before) if (!now.has(b.label)) out.push(`${b.label}: no longer reported (was ${withUnit(b.value, b.unit)})`);
  return out;
}

/**
 * The classification schemes whose result differs between two versions of a report, matched by scheme name, as plain
 * sentences: "Weber class (Weber & Janicki): Class B (…) → Class C (…)". A scheme applied in only one version is
 * listed as newly applied or no longer applied.
 *
 * @param before schemes of the earlier version
 * @param after schemes of the current version
 * @returns one sentence per changed scheme, in the order of `after` (then schemes no longer applied)
 */
export function describeSchemeChanges(
  before: readonly Pick<ReportScheme, "name" | "category">[],
  after: readonly Pick<ReportScheme, "name" | "category">[],
): string[] {
  const old = new Map(before.map((s) => [s.name, s.category]));
  const out: string[] = [];
  for (const s of after) {
    const was = old.get(s.name);
    if (was === undefined) out.push(`${s.name}: newly applied, ${s.category}`);
    else if (was !== s.category) out.push(`${s.name}: ${was} → ${s.category}`);
  }
  const now = new Set(after.map((s) => s.name));
  for (const s of before) if (!now.has(s.name)) out.push(`${s.name}: no longer applied (was ${s.category})`);
  return out;
}
