import type { AnalysisResult } from "../analysis";
import { formatComparisonValue } from "./formatComparison";

type Step = AnalysisResult["interpretation"]["path"]["steps"][number];

/** The patient's values a step compared, as the report's path table writes them (each once). */
const stepValues = (st: Step) => [...new Set(st.checks.flatMap((c) => c.comparisons).map(formatComparisonValue))].join("; ");

const quote = (s: string) => `“${s}”`;

/**
 * The interpretation findings that differ between two analyses of one test, as plain sentences,
 * most decisive first: the steps of the stepwise interpretation whose finding changed (matched by
 * step; a step reached in only one analysis is named as such) and where the path ends, then the
 * support for each limitation pattern, then the grade of each classification scheme, and last the
 * patient values a step compared (e.g. a % of predicted) where they changed. Texts are compared as
 * written for the reader, so only a change the report shows is listed.
 *
 * Example: `Interpretation step “Anaerobic threshold (VT1)”: “VT1 not low” → “low VT1: oxygen delivery or utilisation limitation”`.
 *
 * @param before the analysis the earlier report text was written for
 * @param after the current analysis
 * @returns one sentence per change; empty when the findings are the same
 */
export function describeInterpretationChanges(before: AnalysisResult, after: AnalysisResult): string[] {
  const a = before.interpretation;
  const b = after.interpretation;
  const out: string[] = [];

  const oldSteps = new Map(a.path.steps.map((s) => [s.nodeId, s]));
  const newIds = new Set(b.path.steps.map((s) => s.nodeId));
  const valueChanges: string[] = [];
  for (const s of b.path.steps) {
    const was = oldSteps.get(s.nodeId);
    if (!was) {
      out.push(`Interpretation step ${quote(s.title)}: now reached, finding ${quote(s.finding)}`);
      continue;
    }
    if (was.finding !== s.finding) out.push(`Interpretation step ${quote(s.title)}: ${quote(was.finding)} → ${quote(s.finding)}`);
    const v0 = stepValues(was);
    const v1 = stepValues(s);
    if (v0 !== v1) valueChanges.push(`Interpretation step ${quote(s.title)}, values compared: ${v0 || "none"} → ${v1 || "none"}`);
  }
  for (const s of a.path.steps)
    if (!newIds.has(s.nodeId)) out.push(`Interpretation step ${quote(s.title)}: no longer reached (was ${quote(s.finding)})`);
  const endA = a.path.end?.label ?? "no conclusion";
  const endB = b.path.end?.label ?? "no conclusion";
  if (endA !== endB) out.push(`Interpretation path ends: ${quote(endA)} → ${quote(endB)}`);

  const oldPatterns = new Map(a.patterns.map((p) => [p.patternId, p]));
  const support = (s: string) => s.replace(/-/g, " ");
  for (const p of b.patterns) {
    const was = oldPatterns.get(p.patternId);
    if (!was) out.push(`Pattern ${quote(p.label)}: newly assessed, support ${support(p.support)}`);
    else if (was.support !== p.support)
      out.push(`Pattern ${quote(p.label)}: support ${support(was.support)} → ${support(p.support)}`);
    else if (was.statement !== p.statement)
      out.push(`Pattern ${quote(p.label)}: ${quote(was.statement)} → ${quote(p.statement)}`);
  }

  const oldSchemes = new Map(a.schemes.map((s) => [s.schemeId, s]));
  const grade = (s: AnalysisResult["interpretation"]["schemes"][number]) => s.overall?.label ?? "not assessable";
  for (const s of b.schemes) {
    const was = oldSchemes.get(s.schemeId);
    if (was && grade(was) !== grade(s)) out.push(`${s.name}: ${grade(was)} → ${grade(s)}`);
    else if (!was) out.push(`${s.name}: newly graded, ${grade(s)}`);
  }
  return [...out, ...valueChanges];
}
