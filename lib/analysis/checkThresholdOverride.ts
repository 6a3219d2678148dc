import { makeIssue, type Issue } from "../core";
import { applyThresholdOverrides, type ThresholdOverride } from "../thresholds";
import type { AnalysisResult } from "./types";

/**
 * Check a reviewer's threshold override against the test before it is saved. Errors (the override is refused):
 * a time outside the incremental exercise phase; a VO2 above the test's peak VO2 or never reached during the
 * incremental phase; VT1 at or above VT2 (or VT2 at or below VT1), where the other threshold is the one in force
 * (the reviewer's or the automatic value). A threshold lies inside the incremental exercise and below peak VO2,
 * and the RCP follows the AT (common practice). Pure: reads the analysis result only.
 */
export function checkThresholdOverride(
  result: AnalysisResult,
  o: Pick<ThresholdOverride, "which" | "timeS" | "vo2MlMin">,
): Issue[] {
  const name = o.which.toUpperCase();
  const test = result.conditioned;
  const ex = test.exercise;
  const issues: Issue[] = [];
  const refuse = (code: string, message: string) => issues.push(makeIssue("error", code, message, { field: o.which }));
  const mmss = (s: number) => `${Math.floor(s / 60)}:${String(Math.round(s % 60)).padStart(2, "0")}`;
  if (!ex) {
    refuse(
      "override-no-exercise",
      `The incremental exercise phase of this test was not found, so ${name} cannot be placed in it.`,
    );
    return issues;
  }
  if (o.timeS !== undefined && (o.timeS < ex.startS || o.timeS > ex.endS)) {
    refuse(
      "override-outside-exercise",
      `${name} at ${mmss(o.timeS)} lies outside the incremental exercise (${mmss(ex.startS)}–${mmss(ex.endS)}).`,
    );
    return issues;
  }
  // Resolve the override the way the engine will (time ↔ VO2 on the ramp's VO2 trend).
  const applied = applyThresholdOverrides(test, result.thresholds, [
    { which: o.which, timeS: o.timeS, vo2MlMin: o.vo2MlMin, reason: "check", by: "check" },
  ])[o.which];
  const vo2 = applied.vo2MlMin.value;
  if (vo2 === null) {
    refuse("override-unusable", `${name}: neither the time nor the VO2 given can be placed on this test.`);
    return issues;
  }
  const peak = result.indices.peaks.vo2MlMin.value;
  if (peak !== null && vo2 > peak)
    refuse(
      "override-above-peak",
      `${name} at ${Math.round(vo2)} mL/min lies above this test's peak VO2 (${Math.round(peak)} mL/min).`,
    );
  // VO2 at the start of the incremental exercise: mean of its first 30 s of breaths
  const first = test.clean.filter((r) => r.timeS >= ex.startS && r.timeS <= ex.startS + 30 && Number.isFinite(r.vo2MlMin));
  const startVo2 = first.length > 0 ? first.reduce((a, r) => a + (r.vo2MlMin as number), 0) / first.length : null;
  if (o.timeS === undefined && startVo2 !== null && vo2 < startVo2)
    refuse(
      "override-not-reached",
      `${name} at ${Math.round(vo2)} mL/min lies below the VO2 at the start of the incremental exercise (${Math.round(startVo2)} mL/min).`,
    );
  const other = o.which === "vt1" ? result.thresholds.vt2 : result.thresholds.vt1;
  const otherVo2 = other.vo2MlMin.value;
  if (otherVo2 !== null) {
    const who = other.overridden ? "set by review" : "automatic";
    if (o.which === "vt1" && vo2 >= otherVo2)
      refuse(
        "override-order",
        `VT1 (${Math.round(vo2)} mL/min) must lie below VT2 (${Math.round(otherVo2)} mL/min, ${who}). If VT2 is wrong, set VT2 first.`,
      );
    if (o.which === "vt2" && vo2 <= otherVo2)
      refuse(
        "override-order",
        `VT2 (${Math.round(vo2)} mL/min) must lie above VT1 (${Math.round(otherVo2)} mL/min, ${who}). If VT1 is wrong, set VT1 first.`,
      );
  }
  return issues;
}
