import { evaluateCondition, evaluateRule, type EvalContext } from "./evaluateCondition";
import type { EffortResult } from "./types";

/** The verdict of effort.json whose condition holds first in this context (or the "otherwise" one). */
function verdictIn(ctx: EvalContext) {
  const e = ctx.data.effort;
  for (const v of e.verdicts) if (evaluateCondition(v.when, ctx).outcome === true) return v;
  return e.otherwise;
}

/**
 * Test validity and effort, judged before anything else (effort.json): the criteria rules (peak RER,
 * heart rate, breathing reserve, plateau, desaturation) are evaluated and the first verdict whose
 * condition is true is taken. A verdict that disallows peak conclusions restricts interpretation to
 * effort-independent variables (VE/VCO2 slope, OUES, VT1). Where an end of a measurement's uncertainty band
 * (`EvalContext.bandEnds`, e.g. peak RER ± 2 standard errors) gives another verdict, `borderline` says which.
 */
export function assessEffort(ctx: EvalContext): EffortResult {
  const criteria = ctx.data.effort.criteria.map((id) => evaluateRule(id, ctx));
  const v = verdictIn(ctx);
  const parts: string[] = [];
  for (const end of ctx.bandEnds ?? []) {
    const other = [verdictIn(end.low), verdictIn(end.high)].filter((o) => o.key !== v.key).map((o) => o.label);
    if (other.length > 0) parts.push(`the ${end.words} reaches ${[...new Set(other)].map((o) => `"${o}"`).join(" and ")}`);
  }
  const borderline = parts.join("; ");
  // a physiological-limit verdict names the limit that was reached, not the list of possible ones
  const met = criteria.filter((c) => c.ruleId !== "rer-maximal" && c.outcome === true).map((c) => c.label);
  const restsOnLimit = "restsOnLimit" in v && v.restsOnLimit === true;
  const namesLimit = restsOnLimit && met.length > 0;
  return {
    verdict: v.key,
    label: namesLimit ? `${v.label}: ${met.join("; ")}` : v.label,
    severity: v.severity,
    peakConclusionsAllowed: v.peakConclusionsAllowed,
    restsOnLimit,
    criteria,
    text: criteria.map((c) => c.text).join("; ") + (borderline ? `; borderline: ${borderline}` : ""),
    ...(borderline ? { borderline } : {}),
  };
}
