import { makeIssue, sortIssues, type Issue } from "../core";
import { applySchemes } from "./applySchemes";
import { assessEffort } from "./assessEffort";
import { buildVariables } from "./buildVariables";
import type { EvalContext } from "./evaluateCondition";
import { unique } from "./format";
import { INTERPRETATION_DATA, type InterpretationData } from "./interpretationData";
import { rankPatterns } from "./rankPatterns";
import { resolveChoices } from "./resolveChoices";
import { runGraph } from "./runGraph";
import type { InterpretInput, InterpretSettings, Interpretation } from "./types";
import { REFERRAL_QUESTIONS } from "./types";

/** Build the evaluation context (variables, resolved choices) for one input. */
export function makeContext(
  input: InterpretInput,
  settings: InterpretSettings = {},
  data: InterpretationData = INTERPRETATION_DATA,
) {
  const resolved = resolveChoices(data, settings);
  const ctx: EvalContext = {
    vars: buildVariables(input, data),
    data,
    choices: resolved.options,
    predicted: input.predictedEquations ?? {},
    reasons: Object.fromEntries(
      Object.entries(input.reasons ?? {}).filter((e): e is [string, string] => typeof e[1] === "string" && e[1] !== ""),
    ),
    names: Object.fromEntries(
      Object.entries(input.names ?? {}).filter((e): e is [string, string] => typeof e[1] === "string" && e[1] !== ""),
    ),
    ruleCache: new Map(),
  };
  // one context per end of each band, sharing everything but the variables (and the rule memo, a function of them)
  const at = (values: InterpretInput["values"]): EvalContext => ({
    ...ctx,
    vars: buildVariables({ ...input, values }, data),
    ruleCache: new Map(),
    bandEnds: [],
  });
  ctx.bandEnds = (input.uncertainty ?? []).map((u) => ({
    words: u.words,
    low: at({ ...input.values, ...u.low }),
    high: at({ ...input.values, ...u.high }),
    ...(u.detail ? { detail: u.detail } : {}),
  }));
  return { ctx, resolved };
}

/**
 * Interpret one test: effort first, then the stepwise flow (effort → peak VO2 → AT → cardiovascular
 * discriminators → breathing reserve → gas exchange; ATS/ACCP 2003 and Wasserman-school flowcharts),
 * limitation patterns ranked by support, and the published schemes the referral question selects.
 * Every cut-off comes from reference-equations/interpretation/*.json with its source and evidence
 * status; where sources disagree the lab's choice (`settings.choices`) is applied and reported in
 * `settingsUsed`. Missing inputs make a step "not assessable"; they never throw.
 *
 * @example interpret({ patient: { sex: "male", ageY: 60 }, referral: "general", values: { peakVo2PctPred: 62 } })
 */
export function interpret(
  input: InterpretInput,
  settings: InterpretSettings = {},
  data: InterpretationData = INTERPRETATION_DATA,
): Interpretation {
  const issues: Issue[] = [];
  const referral = REFERRAL_QUESTIONS.includes(input.referral) ? input.referral : "general";
  if (referral !== input.referral) {
    issues.push(
      makeIssue(
        "warning",
        "unknown-referral",
        `Referral question "${String(input.referral)}" is not known; general interpretation used.`,
        { field: "referral" },
      ),
    );
  }
  const { ctx, resolved } = makeContext({ ...input, referral }, settings, data);
  issues.push(...resolved.issues);

  const effort = assessEffort(ctx);
  ctx.vars = { ...ctx.vars, effortVerdict: effort.verdict };
  if (effort.borderline)
    issues.push(
      makeIssue(
        "warning",
        "effort-verdict-borderline",
        `The effort verdict (${effort.label}) rests on a value near its cut-off: ${effort.borderline}. Read the verdict, and the conclusions it allows, with that in mind.`,
        { field: "effort" },
      ),
    );
  if (!effort.peakConclusionsAllowed) {
    issues.push(
      makeIssue(
        "warning",
        "submaximal-test",
        "Maximal effort was not demonstrated: peak values may understate capacity, and only effort-independent variables (VE/VCO2 slope, OUES, VT1) are interpreted.",
        { field: "effort" },
      ),
    );
  } else if (effort.verdict === "not-assessable") {
    issues.push(
      makeIssue(
        "warning",
        "effort-not-assessable",
        "Effort could not be assessed (peak RER missing); peak values are read with caution.",
        { field: "effort" },
      ),
    );
  }

  const path = runGraph(data.flow.graph, ctx);
  for (const s of path.steps) {
    if (s.outcome === "not-assessable") {
      issues.push(makeIssue("info", `not-assessable-${s.nodeId}`, `${s.title}: ${s.finding}.`, { field: `path.${s.nodeId}` }));
    }
  }
  const patterns = rankPatterns(ctx, effort, path);
  const applied = applySchemes(ctx, effort, { referral, addSchemes: settings.addSchemes, removeSchemes: settings.removeSchemes });
  issues.push(...applied.issues);

  const rules = Object.fromEntries(ctx.ruleCache);
  const sourceIds = unique([
    ...data.flow.sourceIds,
    ...Object.values(rules).flatMap((r) => r.sourceIds),
    ...path.steps.flatMap((s) => s.sourceIds),
    ...patterns.flatMap((p) => p.sourceIds),
    ...applied.schemes.flatMap((s) => [...s.sourceIds, ...s.axes.flatMap((a) => a.sourceIds)]),
  ]);
  return {
    referral,
    effort,
    path,
    patterns,
    schemes: applied.schemes,
    rules,
    issues: sortIssues(issues),
    settingsUsed: resolved.settingsUsed,
    sourceIds,
  };
}
