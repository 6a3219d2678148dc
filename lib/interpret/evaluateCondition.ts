import type { EvidenceStatus } from "../core";
import type { InterpretationData } from "./interpretationData";
import type { ChoiceOptionSchema, Condition } from "./schema";
import type { ChoiceUse, ComparisonTrace, OneSidedReading, Outcome, PredictedEquationLabels, RuleResult } from "./types";
import { variableInfo } from "./variables";
import { OP_TEXT, categoryText, formatCutoff, formatValue, nearCutoffNote, snapToCutoff, unique, weakestStatus } from "./format";
import type { z } from "zod";

export type VarValue = number | string | boolean | null;
export type ChoiceOption = z.infer<typeof ChoiceOptionSchema>;

/** Everything a condition needs: the patient's variables, the data, and the lab's resolved choices. */
export interface EvalContext {
  vars: Readonly<Record<string, VarValue>>;
  data: InterpretationData;
  /** choice id → selected option. */
  choices: Readonly<Record<string, ChoiceOption>>;
  predicted: PredictedEquationLabels;
  /** Why a variable is missing (`InterpretInput.reasons`), by variable name. */
  reasons: Readonly<Record<string, string>>;
  /**
   * What a value was measured as, by variable name, where that differs from the variable's usual label
   * (`InterpretInput.names`, e.g. the VE/VCO2 slope to a break the fit placed when no RCP was found).
   */
  names?: Readonly<Record<string, string>>;
  /** Values read on one side of their cut-off only (`InterpretInput.readOneSided`), by variable name. */
  oneSided?: Readonly<Record<string, OneSidedReading>>;
  /** Memo of rule results (rules are pure functions of vars and choices). */
  ruleCache: Map<string, RuleResult>;
  /**
   * The contexts at each end of a measurement's uncertainty band (`InterpretInput.uncertainty`), for the schemes: the
   * variables recomputed with the band's end, each with its own rule memo.
   */
  bandEnds?: readonly {
    words: string;
    low: EvalContext;
    high: EvalContext;
    detail?: { variables: readonly string[]; words: string };
  }[];
}

export interface ConditionResult {
  outcome: Outcome;
  text: string;
  comparisons: ComparisonTrace[];
  choicesUsed: ChoiceUse[];
  /** A met category test that names a group of patients ("men"): shown as a prefix of its `all` group. */
  qualifier?: boolean;
  /** A false `all` group that fails on a category test (e.g. the women's branch for a man): beside the point. */
  offTopic?: boolean;
}

function chosen(ctx: EvalContext, choiceId: string, uses: ChoiceUse[]): ChoiceOption {
  const opt = ctx.choices[choiceId];
  if (!opt) throw new Error(`choice ${choiceId} was not resolved`);
  uses.push({ choiceId, optionId: opt.id });
  return opt;
}

const NEGATED: Record<string, string> = { "<": ">=", "<=": ">", ">": "<=", ">=": "<", "==": "!=", "!=": "==", in: "not in" };

function compare(raw: VarValue, op: string, cutoff: number | string | boolean | readonly string[]): boolean {
  const value = typeof raw === "number" && typeof cutoff === "number" ? snapToCutoff(raw, cutoff) : raw;
  switch (op) {
    case "<":
      return (value as number) < (cutoff as number);
    case "<=":
      return (value as number) <= (cutoff as number);
    case ">":
      return (value as number) > (cutoff as number);
    case ">=":
      return (value as number) >= (cutoff as number);
    case "==":
      return value === cutoff;
    case "!=":
      return value !== cutoff;
    case "in":
      return (cutoff as readonly string[]).includes(String(value));
    default:
      throw new Error(`unknown operator ${op}`);
  }
}

/** "VO2 at VT1 (mL/kg/min) not available (why)": a missing input in words, with the reason it is missing when known. */
export function notAvailableText(ctx: Pick<EvalContext, "names" | "reasons">, variable: string): string {
  const unit = variableInfo(variable).unit;
  const why = ctx.reasons[variable];
  return `${variableLabel(ctx, variable)}${unit ? ` (${unit})` : ""} not available${why ? ` (${why})` : ""}`;
}

function comparisonText(
  ctx: EvalContext,
  variable: string,
  value: VarValue,
  op: string,
  cutoff: ComparisonTrace["cutoff"],
): string {
  const info = { ...variableInfo(variable), label: variableLabel(ctx, variable) };
  const unit = info.unit ? ` ${info.unit}` : "";
  const pred = info.predictedKey && ctx.predicted[info.predictedKey] ? ` (${ctx.predicted[info.predictedKey]})` : "";
  if (value === null) return notAvailableText(ctx, variable);
  if (info.kind === "boolean") return `${info.label}: ${formatValue(variable, value)}`;
  if (info.kind === "string") {
    // categories in words, never as operators: "Sex: male, not female"; "Effort: submaximal, not maximal or …"
    const says = (v: unknown) => categoryText(variable, String(v));
    const listed = Array.isArray(cutoff) ? cutoff.map(says).join(" or ") : says(cutoff);
    const matches = op === "==" || op === "in";
    return matches ? `${info.label}: ${says(value)}` : `${info.label}: ${says(value)}, not ${listed}`;
  }
  // the value at its display decimals; when rounding hides its side of the cut-off, the side in words
  const side = typeof value === "number" && typeof cutoff === "number" ? nearCutoffNote(variable, value, cutoff) : "";
  return `${info.label} ${formatValue(variable, value)}${unit}${pred}${side} ${OP_TEXT[op]} ${formatCutoff(variable, cutoff as number)}${unit}`;
}

/** A variable's label in this context: what the value was measured as (`EvalContext.names`), else its usual label. */
export function variableLabel(ctx: Pick<EvalContext, "names">, variable: string): string {
  return ctx.names?.[variable] ?? variableInfo(variable).label;
}

/**
 * Evaluate a tri-state condition: true, false, or null when an input needed for the answer is missing.
 * `all` is false if any part is false, else null if any part is null; `any` is true if any part is true,
 * else null if any is null; `notTrue` reads null as "not true"; `atLeast n of` is decided as soon as
 * the count of true parts (or of possible true parts) settles it. Texts always state what is true of
 * the patient (a failed comparison shows the negated operator), so `not` keeps its operand's text.
 */
export function evaluateCondition(cond: Condition, ctx: EvalContext): ConditionResult {
  const uses: ChoiceUse[] = [];
  const comparisons: ComparisonTrace[] = [];
  const sub = (c: Condition) => {
    const r = evaluateCondition(c, ctx);
    uses.push(...r.choicesUsed);
    comparisons.push(...r.comparisons);
    return r;
  };
  const done = (outcome: Outcome, text: string): ConditionResult => ({ outcome, text, comparisons, choicesUsed: uses });

  if ("rule" in cond) {
    const r = evaluateRule(cond.rule, ctx);
    uses.push(...r.choicesUsed);
    comparisons.push(...r.comparisons);
    return done(r.outcome, r.outcome === null ? `${r.label}: not assessable` : r.outcome ? r.label : r.labelFalse);
  }
  if ("choice" in cond) {
    const opt = chosen(ctx, cond.choice, uses);
    const r = sub(opt.condition!);
    return done(r.outcome, r.text);
  }
  if ("all" in cond || "any" in cond) {
    const parts = ("all" in cond ? cond.all : cond.any).map(sub);
    const isAll = "all" in cond;
    const outs = parts.map((p) => p.outcome);
    let outcome: Outcome;
    if (isAll) outcome = outs.includes(false) ? false : outs.includes(null) ? null : true;
    else outcome = outs.includes(true) ? true : outs.includes(null) ? null : false;
    if (isAll) {
      // show what decided: a false group shows its false parts; a group's met category test names the group
      const lead = parts.filter((p) => p.qualifier && p.outcome === true).map((p) => p.text);
      const rest = parts.filter((p) => !(p.qualifier && p.outcome === true));
      const shown = outcome === false ? rest.filter((p) => p.outcome === false) : rest;
      const offCategory = outcome === false && shown.some((p) => isCategoryMiss(p));
      const body = (offCategory ? shown.filter(isCategoryMiss) : shown).map((p) => p.text).join(" and ");
      const text = lead.length && body ? `${lead.join(", ")}: ${body}` : lead.length ? lead.join(", ") : body;
      return { ...done(outcome, text), ...(offCategory ? { offTopic: true } : {}) };
    }
    // an `any` shows the parts that decided it: the met ones, else the undecided ones, else every relevant one
    const decisive =
      outcome === true
        ? parts.filter((p) => p.outcome === true)
        : outcome === null
          ? parts.filter((p) => p.outcome === null)
          : parts;
    const relevant = decisive.filter((p) => !p.offTopic);
    // a false `any` failed on every part: each part's text shows its own failed comparison, so they read with "and"
    // ("Peak VO2 18.3 ≥ 10.0 and 66 % ≥ 35 %"), never "or"
    return done(outcome, (relevant.length ? relevant : decisive).map((p) => p.text).join(outcome === false ? " and " : " or "));
  }
  if ("not" in cond) {
    const r = sub(cond.not);
    return done(r.outcome === null ? null : !r.outcome, r.text);
  }
  if ("notTrue" in cond) {
    const r = sub(cond.notTrue);
    return done(r.outcome !== true, r.text);
  }
  if ("atLeast" in cond) {
    const parts = cond.of.map(sub);
    const t = parts.filter((p) => p.outcome === true).length;
    const u = parts.filter((p) => p.outcome === null).length;
    const outcome: Outcome = t >= cond.atLeast ? true : t + u < cond.atLeast ? false : null;
    const n = parts.length;
    const met = parts.filter((p) => p.outcome === true).map((p) => p.text);
    const unmet = parts.filter((p) => p.outcome !== true).map((p) => p.text);
    // name the items that count, so the line reads as the reason for the result
    if (outcome === true) return done(outcome, `${t} of ${n} criteria met (at least ${cond.atLeast} needed): ${met.join("; ")}`);
    const head = `${t} of ${n} criteria met (at least ${cond.atLeast} needed)`;
    const tail = [
      met.length ? `met: ${met.join("; ")}` : "",
      unmet.length ? `${outcome === null ? "not met or not assessable" : "not met"}: ${unmet.join("; ")}` : "",
    ];
    return done(outcome, `${head}; ${tail.filter(Boolean).join("; ")}`);
  }
  // comparison
  const variable = typeof cond.var === "string" ? cond.var : chosen(ctx, cond.var.choice, uses).variable!;
  let cutoff: ComparisonTrace["cutoff"];
  if (cond.op === "in") cutoff = cond.values;
  else if (typeof cond.value === "object") cutoff = chosen(ctx, cond.value.choice, uses).value!;
  else cutoff = cond.value;
  const raw = ctx.vars[variable];
  const value: VarValue = raw === undefined || (typeof raw === "number" && !Number.isFinite(raw)) ? null : raw;
  // a one-sided value on its unread side of the cut-off is not assessable, with its reason (never true nor false)
  const oneSided = ctx.oneSided?.[variable];
  if (oneSided && typeof value === "number" && typeof cutoff === "number") {
    const readable = oneSided.side === "high" ? value >= cutoff : value <= cutoff;
    if (!readable) {
      const info = variableInfo(variable);
      const text = `${variableLabel(ctx, variable)} ${formatValue(variable, value)}${info.unit ? ` ${info.unit}` : ""} not read against ${formatCutoff(variable, cutoff)}${info.unit ? ` ${info.unit}` : ""} (${oneSided.reason})`;
      comparisons.push({
        variable,
        label: variableLabel(ctx, variable),
        unit: info.unit,
        value,
        op: cond.op,
        cutoff,
        outcome: null,
        text,
      });
      return done(null, text);
    }
  }
  const outcome: Outcome = value === null ? null : compare(value, cond.op, cutoff);
  // The text always states what is true of the patient: a failed comparison shows the negated operator.
  const text = comparisonText(ctx, variable, value, outcome === false ? NEGATED[cond.op] : cond.op, cutoff);
  const info = variableInfo(variable);
  comparisons.push({ variable, label: variableLabel(ctx, variable), unit: info.unit, value, op: cond.op, cutoff, outcome, text });
  const group =
    info.kind === "string" && outcome === true && cond.op === "==" && value !== null ? info.groups?.[String(value)] : undefined;
  if (group) return { ...done(outcome, group), qualifier: true };
  return done(outcome, text);
}

/** A failed test on a category (sex, referral, effort): the part is about other patients. */
function isCategoryMiss(p: ConditionResult): boolean {
  return p.outcome === false && p.comparisons.length === 1 && variableInfo(p.comparisons[0].variable).kind === "string";
}

/** Evaluate a rule by id (memoised in the context): its finding, readable line, sources and status. */
export function evaluateRule(ruleId: string, ctx: EvalContext): RuleResult {
  const cached = ctx.ruleCache.get(ruleId);
  if (cached) return cached;
  const rule = ctx.data.ruleById.get(ruleId);
  if (!rule) throw new Error(`unknown rule ${ruleId}`);
  const r = evaluateCondition(rule.when, ctx);
  const uses = dedupeUses(r.choicesUsed);
  const options = uses.map((u) => ctx.choices[u.choiceId]);
  const status: EvidenceStatus = weakestStatus([rule.status, ...options.map((o) => o.status)]);
  const outcomeText = r.outcome === null ? "not assessable" : r.outcome ? rule.label : rule.labelFalse;
  const result: RuleResult = {
    ruleId,
    outcome: r.outcome,
    label: rule.label,
    labelFalse: rule.labelFalse,
    text: `${r.text} → ${outcomeText}`,
    comparisons: r.comparisons,
    sourceIds: unique([...rule.sourceIds, ...options.flatMap((o) => o.sourceIds)]),
    status,
    choicesUsed: uses,
    ...(rule.note ? { note: rule.note } : {}),
  };
  ctx.ruleCache.set(ruleId, result);
  return result;
}

export function dedupeUses(uses: readonly ChoiceUse[]): ChoiceUse[] {
  const seen = new Map<string, ChoiceUse>();
  for (const u of uses) seen.set(`${u.choiceId}:${u.optionId}`, u);
  return [...seen.values()];
}

/** The variables a condition reads (through rules and the chosen options). */
export function conditionVariables(cond: Condition, ctx: EvalContext, out: Set<string> = new Set()): Set<string> {
  if ("rule" in cond) conditionVariables(ctx.data.ruleById.get(cond.rule)!.when, ctx, out);
  else if ("choice" in cond) conditionVariables(ctx.choices[cond.choice].condition!, ctx, out);
  else if ("all" in cond) cond.all.forEach((c) => conditionVariables(c, ctx, out));
  else if ("any" in cond) cond.any.forEach((c) => conditionVariables(c, ctx, out));
  else if ("not" in cond) conditionVariables(cond.not, ctx, out);
  else if ("notTrue" in cond) conditionVariables(cond.notTrue, ctx, out);
  else if ("atLeast" in cond) cond.of.forEach((c) => conditionVariables(c, ctx, out));
  else out.add(typeof cond.var === "string" ? cond.var : ctx.choices[cond.var.choice].variable!);
  return out;
}
