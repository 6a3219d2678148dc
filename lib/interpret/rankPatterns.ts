import { conditionVariables, evaluateRule, type EvalContext } from "./evaluateCondition";
import type { EffortResult, PathResult, PatternFeatureResult, PatternResult } from "./types";
import { variableInfo } from "./variables";

const LEVEL_RANK: Record<PatternResult["support"], number> = {
  strong: 4,
  moderate: 3,
  weak: 2,
  "not-supported": 1,
  "not-assessable": 0,
};

/**
 * Limitation patterns (patterns.json) with the evidence for and against each from this test, ranked
 * by support. Never a single diagnosis: every pattern is worded "consistent with ...". When effort is
 * not shown to be maximal, features resting on effort-dependent values are not assessable (except for
 * patterns that describe effort itself).
 *
 * Support needs at least one defining feature for the pattern (a key feature expected present; when a pattern has none,
 * any key feature): when none is assessed as present the pattern is "not assessable" (the absence of other findings
 * cannot stand in for its defining finding).
 * When the stepwise interpretation ends with no limitation identified (end severity 0), a pattern of weak
 * support is reported as not supported, so the patterns never contradict the conclusion. Engine rules,
 * not clinical cut-offs (common practice).
 *
 * @param path the stepwise interpretation's result; omit to rank the patterns on their own
 */
export function rankPatterns(ctx: EvalContext, effort: EffortResult, path?: PathResult): PatternResult[] {
  const noLimitation = path?.end?.severity === 0;
  const { supportLevels, patterns } = ctx.data.patterns;
  const results = patterns.map((p): PatternResult => {
    const features: PatternFeatureResult[] = p.features.map((f) => {
      const rule = evaluateRule(f.rule, ctx);
      const masked =
        !effort.peakConclusionsAllowed &&
        !p.usesEffortDependent &&
        [...conditionVariables({ rule: f.rule }, ctx)].some((v) => variableInfo(v).effortDependent);
      const evidence: PatternFeatureResult["evidence"] =
        masked || rule.outcome === null ? "not-assessable" : rule.outcome === f.expect ? "for" : "against";
      const text = masked ? `${rule.label}: not assessable (maximal effort not demonstrated)` : rule.text;
      return { ruleId: f.rule, expected: f.expect, weight: f.weight, key: Boolean(f.key), evidence, text };
    });
    const forF = features.filter((f) => f.evidence === "for");
    const against = features.filter((f) => f.evidence === "against");
    const na = features.filter((f) => f.evidence === "not-assessable");
    const wFor = forF.reduce((s, f) => s + f.weight, 0);
    const wAgainst = against.reduce((s, f) => s + f.weight, 0);
    const score = wFor + wAgainst > 0 ? wFor / (wFor + wAgainst) : null;
    const keys = features.filter((f) => f.key);
    // the findings that define the pattern are its key findings expected present (a reduced capacity for deconditioning);
    // key findings expected absent (no desaturation) can rule it out but not support it on their own
    const defining = keys.filter((f) => f.expected);
    const basis = defining.length ? defining : keys;
    let support: PatternResult["support"];
    let supportNote: string | undefined;
    if (score === null) support = "not-assessable";
    else if (against.some((f) => f.key)) support = "not-supported";
    else if (!basis.some((f) => f.evidence === "for")) {
      support = "not-assessable";
      supportNote = `its key finding could not be assessed (${basis.map((f) => ruleLabel(f.ruleId, ctx)).join("; ")}); other findings cannot support it on their own`;
    } else if (score >= supportLevels.strong && forF.length >= supportLevels.minFor && keys.every((f) => f.evidence === "for"))
      support = "strong";
    else if (score >= supportLevels.moderate) support = "moderate";
    else if (score > 0) support = "weak";
    else support = "not-supported";
    if (na.some((f) => f.key) && (support === "strong" || support === "moderate")) support = "weak";
    if (noLimitation && support === "weak") {
      support = "not-supported";
      supportNote = "support was weak and the stepwise interpretation found no exercise limitation";
    }
    // a finding of this pattern that an end of a measurement's uncertainty band would reverse (an MVV estimated from FEV1,
    // the VT1 band, a slope's band): said beside the pattern wherever it is stated, as the flow and the schemes do
    const borderline: string[] = [];
    if (support === "strong" || support === "moderate")
      for (const end of ctx.bandEnds ?? [])
        for (const f of features) {
          if (f.evidence === "not-assessable") continue;
          const here = evaluateRule(f.ruleId, ctx);
          const flipped = [evaluateRule(f.ruleId, end.low), evaluateRule(f.ruleId, end.high)].find(
            (r) => r.outcome !== null && here.outcome !== null && r.outcome !== here.outcome,
          );
          if (flipped)
            borderline.push(
              `the ${end.words} gives "${flipped.outcome ? flipped.label : flipped.labelFalse}", which would ${flipped.outcome === f.expected ? "add to" : "weigh against"} it`,
            );
        }
    const statement =
      support === "not-assessable"
        ? `Whether the findings are consistent with ${p.consistentWith} cannot be assessed from the data available.`
        : support === "not-supported"
          ? `The findings are not consistent with ${p.consistentWith}.`
          : `The findings are consistent with ${p.consistentWith} (${support} support).`;
    return {
      patternId: p.id,
      label: p.label,
      statement,
      support,
      ...(supportNote ? { supportNote } : {}),
      ...(borderline.length ? { borderline: [...new Set(borderline)].join("; ") } : {}),
      score,
      for: forF,
      against,
      notAssessable: na,
      sourceIds: p.sourceIds,
      status: p.status,
    };
  });
  return results
    .map((r, i) => ({ r, i }))
    .sort(
      (a, b) =>
        LEVEL_RANK[b.r.support] - LEVEL_RANK[a.r.support] ||
        (b.r.score ?? -1) - (a.r.score ?? -1) ||
        b.r.for.reduce((s, f) => s + f.weight, 0) - a.r.for.reduce((s, f) => s + f.weight, 0) ||
        a.i - b.i,
    )
    .map((x) => x.r);
}

/** The rule's label (what the pattern needs), for notes. */
function ruleLabel(ruleId: string, ctx: EvalContext): string {
  return ctx.data.ruleById.get(ruleId)?.label ?? ruleId;
}
