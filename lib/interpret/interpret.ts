import { makeIssue, sortIssues, type Issue } from "../core";
import { applySchemes } from "./applySchemes";
import { assessEffort } from "./assessEffort";
import { BETA_BLOCKER_ONE_SIDED } from "./composeDraft";
import { buildVariables } from "./buildVariables";
import type { EvalContext } from "./evaluateCondition";
import { unique } from "./format";
import { INTERPRETATION_DATA, type InterpretationData } from "./interpretationData";
import { rankPatterns } from "./rankPatterns";
import { resolveChoices } from "./resolveChoices";
import { runGraph } from "./runGraph";
import type { InterpretInput, InterpretSettings, Interpretation, OneSidedReading } from "./types";
import { REFERRAL_QUESTIONS } from "./types";

/** Build the evaluation context (variables, resolved choices) for one input. */
export function makeContext(
  input: InterpretInput,
  settings: InterpretSettings = {},
  data: InterpretationData = INTERPRETATION_DATA,
) {
  const resolved = resolveChoices(data, settings);
  // values shown but not interpreted are missing to every rule, with their reason
  const notRead = Object.entries(input.notRead ?? {}).filter(
    (e): e is [string, string] => typeof e[1] === "string" && e[1] !== "",
  );
  const readable = (values: InterpretInput["values"]): InterpretInput["values"] =>
    notRead.length ? { ...values, ...Object.fromEntries(notRead.map(([k]) => [k, null])) } : values;
  const ctx: EvalContext = {
    vars: buildVariables({ ...input, values: readable(input.values) }, data),
    data,
    choices: resolved.options,
    predicted: input.predictedEquations ?? {},
    reasons: Object.fromEntries([
      ...Object.entries(input.reasons ?? {}).filter((e): e is [string, string] => typeof e[1] === "string" && e[1] !== ""),
      ...notRead,
    ]),
    names: Object.fromEntries(
      Object.entries(input.names ?? {}).filter((e): e is [string, string] => typeof e[1] === "string" && e[1] !== ""),
    ),
    oneSided: Object.fromEntries(
      Object.entries({ ...(input.patient.betaBlocker === true ? BETA_BLOCKER_READING : {}), ...input.readOneSided }).filter(
        (e): e is [string, OneSidedReading] => !!e[1],
      ),
    ),
    ruleCache: new Map(),
  };
  // one context per end of each band, sharing everything but the variables (and the rule memo, a function of them)
  const at = (values: InterpretInput["values"]): EvalContext => ({
    ...ctx,
    vars: buildVariables({ ...input, values: readable(values) }, data),
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
 * On a beta-blocker, predicted-HRmax equations do not describe the heart (common practice): a heart rate short of the
 * predicted range is not read (the drug lowers it), one that reaches it still counts (our reading of one side).
 */
const BETA_BLOCKER_READING: InterpretInput["readOneSided"] = {
  hrPctPred: { side: "high", reason: BETA_BLOCKER_ONE_SIDED },
  hrReserveBpm: { side: "low", reason: BETA_BLOCKER_ONE_SIDED },
};

/** The lowest peak RER any cited source accepts as a maximal test: FRIEND's treadmill inclusion, RER ≥ 1.0 (confirmed). */
export const EFFORT_RER_FLOOR = 1.0;

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
  // heart rate alone, with a peak RER below the lowest any cited source accepts as maximal (FRIEND's RER ≥ 1.0 inclusion,
  // confirmed), is weak evidence of a maximal test: predicted maximal heart rate scatters by about 10 bpm between people
  // (common practice); the verdict stands, said with that caution
  const limits = effort.criteria.filter((c) => c.ruleId !== "rer-maximal" && c.outcome === true).map((c) => c.ruleId);
  const rer = ctx.vars.peakRer;
  const heartRateAlone = effort.restsOnLimit && limits.length === 1 && limits[0] === "hr-reached";
  if (heartRateAlone && (typeof rer !== "number" || rer < EFFORT_RER_FLOOR))
    issues.push(
      makeIssue(
        "warning",
        "effort-rests-on-heart-rate",
        `Effort is judged adequate on heart rate alone (the only effort criterion met), with ${typeof rer === "number" ? `peak RER ${rer.toFixed(rer.toFixed(2) === EFFORT_RER_FLOOR.toFixed(2) ? 3 : 2)} (below ${EFFORT_RER_FLOOR.toFixed(2)})` : "no peak RER"}: predicted maximal heart rate varies by about 10 bpm between people, so the test may have been submaximal and peak values may understate capacity.`,
        { field: "effort" },
      ),
    );
  // the same reliance with a peak RER between that floor and the lab's maximal cut-off: within what FRIEND accepted, so
  // an info line (said because heart rate alone still carries the verdict; common practice)
  else if (
    heartRateAlone &&
    typeof rer === "number" &&
    effort.criteria.some((c) => c.ruleId === "rer-maximal" && c.outcome === false)
  )
    issues.push(
      makeIssue(
        "info",
        "effort-mainly-on-heart-rate",
        `Effort is judged adequate mainly on heart rate: peak RER ${rer.toFixed(2)} is below the maximal-effort cut-off though not below ${EFFORT_RER_FLOOR.toFixed(2)}, and heart rate is the only other criterion met; predicted maximal heart rate varies by about 10 bpm between people.`,
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
