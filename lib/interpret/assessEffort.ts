import { evaluateCondition, evaluateRule, type EvalContext } from "./evaluateCondition";
import type { EffortResult } from "./types";

/**
 * Test validity and effort, judged before anything else (effort.json): the criteria rules (peak RER,
 * heart rate, breathing reserve, plateau, desaturation) are evaluated and the first verdict whose
 * condition is true is taken. A verdict that disallows peak conclusions restricts interpretation to
 * effort-independent variables (VE/VCO2 slope, OUES, VT1).
 */
export function assessEffort(ctx: EvalContext): EffortResult {
  const e = ctx.data.effort;
  const criteria = e.criteria.map((id) => evaluateRule(id, ctx));
  for (const v of e.verdicts) {
    const r = evaluateCondition(v.when, ctx);
    if (r.outcome === true) {
      return {
        verdict: v.key,
        label: v.label,
        severity: v.severity,
        peakConclusionsAllowed: v.peakConclusionsAllowed,
        criteria,
        text: criteria.map((c) => c.text).join("; "),
      };
    }
  }
  const o = e.otherwise;
  return {
    verdict: o.key,
    label: o.label,
    severity: o.severity,
    peakConclusionsAllowed: o.peakConclusionsAllowed,
    criteria,
    text: criteria.map((c) => c.text).join("; "),
  };
}
