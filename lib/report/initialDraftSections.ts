import type { AnalysisResult } from "../analysis";
import { formatClock, formatNumber } from "../units";
import type { ReportSection } from "./reportModel";

/**
 * The first text of a new report draft, built only from values the analysis gives: neutral
 * sentences that restate measurements with their method, and empty prompts for the clinician.
 * They are deliberately not clinical conclusions (the interpretation layer will supply findings).
 */
export function initialDraftSections(result: AnalysisResult): ReportSection[] {
  const measurements: string[] = [];
  const peak = result.peak.vo2MlMin;
  if (peak.value !== null) {
    const perKg = result.peak.vo2MlKgMin.value;
    measurements.push(
      `Peak VO2 was ${formatNumber(peak.value, 0)} mL/min (${peak.provenance.label})` +
        (perKg !== null ? `, ${formatNumber(perKg, 1)} mL/kg/min.` : "."),
    );
  } else {
    measurements.push(`Peak VO2 could not be determined: ${peak.reason ?? "no reason given"}.`);
  }
  if (result.durationS.value !== null) measurements.push(`The recording lasted ${formatClock(result.durationS.value)} (min:s).`);
  const flagged = result.issues.filter((i) => i.severity !== "info").length;
  if (flagged > 0)
    measurements.push(`${flagged} data-quality ${flagged === 1 ? "problem was" : "problems were"} raised; see Data quality.`);
  return [
    { id: "measurements", title: "Measurements", paragraphs: measurements },
    {
      id: "interpretation",
      title: "Interpretation",
      paragraphs: ["To be written by the reviewing clinician. This version of the software makes no automatic interpretation."],
    },
    { id: "conclusion", title: "Conclusion and recommendations", paragraphs: ["To be completed by the reviewing clinician."] },
  ];
}
