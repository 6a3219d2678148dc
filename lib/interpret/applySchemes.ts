import { makeIssue, type Issue } from "../core";
import {
  conditionVariables,
  dedupeUses,
  evaluateCondition,
  notAvailableText,
  variableLabel,
  type EvalContext,
} from "./evaluateCondition";
import { andList, formatCutoff, formatValue, lowerFirst, unique, weakestStatus } from "./format";
import { variableInfo } from "./variables";
import { runGraph } from "./runGraph";
import type { AxisData, BandData, SchemeData } from "./schema";
import type { ChoiceUse, EffortResult, ReferralQuestion, SchemeAxisResult, SchemeResult } from "./types";

export interface ApplySchemesOptions {
  referral: ReferralQuestion;
  addSchemes?: string[];
  removeSchemes?: string[];
}

/** Which schemes apply: selected by the referral question (and by the choice that picks between alternative algorithms). */
export function selectSchemes(ctx: EvalContext, options: ApplySchemesOptions): SchemeData[] {
  const add = new Set(options.addSchemes ?? []);
  const remove = new Set(options.removeSchemes ?? []);
  return ctx.data.schemes.schemes.filter((s) => {
    if (remove.has(s.id)) return false;
    if (s.selectedBy && ctx.choices[s.selectedBy.choice].id !== s.selectedBy.option) return add.has(s.id);
    return s.referrals.includes(options.referral) || add.has(s.id);
  });
}

function evaluateAxis(
  axis: AxisData,
  bands: BandData[],
  ctx: EvalContext,
  effort: EffortResult,
  uses: ChoiceUse[],
  issues: Issue[],
  schemeId: string,
): SchemeAxisResult {
  const base = {
    axisId: axis.id,
    label: axis.label,
    sourceIds: axis.sourceIds,
    status: axis.status,
    inCombination: axis.inCombination ?? true,
    ...(axis.population ? { population: axis.population } : {}),
  };
  if (axis.appliesWhen) {
    const a = evaluateCondition(axis.appliesWhen, ctx);
    uses.push(...a.choicesUsed);
    if (a.outcome !== true) {
      const reason = a.outcome === false ? `not applicable (${a.text})` : `applicability not assessable (${a.text})`;
      return { ...base, inCombination: false, category: null, text: `${axis.label}: ${reason}`, reason };
    }
  }
  if (axis.requiresMaximalEffort && !effort.peakConclusionsAllowed) {
    const reason = "not assessable: maximal effort not demonstrated";
    return { ...base, category: null, text: `${axis.label}: ${reason}`, reason };
  }
  const tried: string[] = [];
  for (const [i, b] of bands.entries()) {
    const r = evaluateCondition(b.when, ctx);
    uses.push(...r.choicesUsed);
    if (r.outcome === null) {
      // a worse band that cannot be decided (an input not recorded) above a milder band that holds whatever it is: the
      // milder band is a floor ("at least intermediate; high not excluded"), not "not assessable"
      const floor = floorBelow(bands.slice(i + 1), b, ctx);
      if (floor) {
        const words = `at least ${lowerFirst(floor.label)}; ${lowerFirst(b.label)} not excluded (${r.text})`;
        issues.push(
          makeIssue("warning", "scheme-category-floor", `${axis.label}: ${words}.`, { field: `${schemeId}.${axis.id}` }),
        );
        return {
          ...base,
          sourceIds: unique([...axis.sourceIds, ...floor.sourceIds]),
          status: weakestStatus([axis.status, floor.status]),
          category: { key: floor.key, label: `At least ${lowerFirst(floor.label)}`, severity: floor.severity },
          text: `${axis.label}: ${words}`,
          atLeast: true,
        };
      }
      // the undecided input is a yes/no one (ischaemic heart disease): the category each answer would give, so the
      // reader sees "low risk if absent; intermediate if present" instead of "not assessable"
      const dependsOn = categoryByAnswer(bands, ctx);
      if (dependsOn) {
        issues.push(
          makeIssue("warning", "scheme-category-depends-on-input", `${axis.label}: ${dependsOn}.`, {
            field: `${schemeId}.${axis.id}`,
          }),
        );
        return { ...base, category: null, text: `${axis.label}: ${dependsOn}`, reason: dependsOn, dependsOn };
      }
      const reason = `not assessable (${missingWords(bands, ctx) || r.text})`;
      return { ...base, category: null, text: `${axis.label}: ${reason}`, reason };
    }
    if (r.outcome) {
      const reaches = bandReaches(bands, ctx, b.key);
      const reachedSeverities = (ctx.bandEnds ?? [])
        .flatMap((end) => [end.low, end.high].map((e) => categoryWith(bands, e)))
        .filter((o): o is BandData => o !== null && o.key !== b.key)
        .map((o) => o.severity);
      return {
        ...base,
        sourceIds: unique([...axis.sourceIds, ...b.sourceIds]),
        status: weakestStatus([axis.status, b.status]),
        category: { key: b.key, label: b.label, severity: b.severity },
        // a rule's own line may already start with the axis label ("Exercise oscillatory ventilation: yes")
        text: `${r.text.startsWith(`${axis.label}:`) ? r.text : `${axis.label}: ${r.text}`} → ${b.label}${reaches ? `; ${reaches}` : ""}`,
        ...(reaches ? { bandReaches: reaches } : {}),
        ...(reachedSeverities.length ? { bandReachesSeverities: [...new Set(reachedSeverities)] } : {}),
      };
    }
    tried.push(r.text);
  }
  const reason = `value lies between the published bands (${tried.join("; ")})`;
  issues.push(makeIssue("warning", "value-between-bands", `${axis.label}: ${reason}.`, { field: `${schemeId}.${axis.id}` }));
  return { ...base, category: null, text: `${axis.label}: ${reason}`, reason };
}

/** The first of the later bands that holds for sure and is milder than the undecided band, or null. */
function floorBelow(later: BandData[], undecided: BandData, ctx: EvalContext): BandData | null {
  for (const l of later) {
    const o = evaluateCondition(l.when, ctx).outcome;
    // a floor at the mildest band says nothing ("at least low risk"): then the axis stays not assessable
    if (o === true) return l.severity < undecided.severity && l.severity > Math.min(...later.map((x) => x.severity)) ? l : null;
    if (o === null) return null;
  }
  return null;
}

/**
 * When the only inputs an axis lacks are yes/no ones (at most two), the category each answer gives, in words:
 * "depends on ischaemic heart disease (not recorded): low risk (…) if absent; intermediate risk (…) if present". Null when
 * a numeric input is missing, when the axis reads nothing but the missing answers, when an answer still leaves the
 * axis undecided, or when every answer gives the same category (then the caller's reading stands).
 */
function categoryByAnswer(bands: BandData[], ctx: EvalContext): string | null {
  const { used, missing } = axisInputs(bands, ctx);
  if (missing.length === 0 || missing.length > 2 || missing.some((name) => variableInfo(name).kind !== "boolean")) return null;
  // an axis that reads nothing but the missing answer ("oscillatory ventilation: present if present") stays not assessable
  if (missing.length === used.length) return null;
  const answers: { words: string; band: BandData }[] = [];
  for (let mask = 0; mask < 1 << missing.length; mask++) {
    const vars = { ...ctx.vars };
    const said: string[] = [];
    missing.forEach((name, i) => {
      const yes = Boolean(mask & (1 << i));
      vars[name] = yes;
      const word = yes ? "present" : "absent";
      said.push(missing.length > 1 ? `${lowerFirst(variableLabel(ctx, name))} ${word}` : word);
    });
    const band = categoryWith(bands, { ...ctx, vars, ruleCache: new Map(), bandEnds: [] });
    if (!band) return null;
    answers.push({ words: said.join(", "), band });
  }
  if (new Set(answers.map((a) => a.band.key)).size === 1) return null;
  const what = andList(missing.map((name) => lowerFirst(variableLabel(ctx, name))));
  return `depends on ${what} (not recorded): ${answers.map((a) => `${lowerFirst(a.band.label)} if ${a.words}`).join("; ")}`;
}

/**
 * The inputs an axis lacks, each named once with why: "VO2 at VT1 (mL/kg/min) not available (the recording has no
 * VCO2…); VE/VCO2 at VT1 not available (VT1 not given)". A band condition's own text repeats a missing input once per
 * comparison that reads it (three times in the three-tier scheme); "" when no input is missing.
 */
function missingWords(bands: BandData[], ctx: EvalContext): string {
  return axisInputs(bands, ctx)
    .missing.map((name) => notAvailableText(ctx, name))
    .join("; ");
}

/** The inputs an axis's bands read, and those of them not recorded (null or absent), each once. */
function axisInputs(bands: BandData[], ctx: EvalContext): { used: string[]; missing: string[] } {
  const used = [...new Set(bands.flatMap((b) => [...conditionVariables(b.when, ctx)]))];
  return { used, missing: used.filter((name) => ctx.vars[name] === null || ctx.vars[name] === undefined) };
}

/** The first band whose condition holds in this context, or null (not assessable, or between bands). */
function categoryWith(bands: BandData[], alt: EvalContext): BandData | null {
  for (const b of bands) {
    const r = evaluateCondition(b.when, alt);
    if (r.outcome === null) return null;
    if (r.outcome) return b;
  }
  return null;
}

/**
 * Where an end of a measurement's uncertainty band (`EvalContext.bandEnds`) falls in another category of this axis, in
 * words ("the VT1 band 731–902 mL/min (VO2 at VT1 9.1–11.3 mL/kg/min) reaches Class B (…)"); or, when both ends stay in
 * the category but on the other side of one of its cut-offs (a category reached by more than one route, e.g. the
 * three-tier pre-operative scheme's "AT < 8, or two or more risk factors"), which cut-off the band crosses; "" when the
 * whole band stays on the value's side of every cut-off. The value decides the category; this only says how near a
 * boundary it lies, as the clinician reading a class near a cut-off would ask. The band is named in the units the axis
 * grades (the VT1 band per kg where the axis reads mL/kg/min).
 */
function bandReaches(bands: BandData[], ctx: EvalContext, key: string): string {
  const parts: string[] = [];
  const placed = bands.find((b) => b.key === key);
  const read = new Set(bands.flatMap((b) => [...conditionVariables(b.when, ctx)]));
  for (const end of ctx.bandEnds ?? []) {
    const ends = [end.low, end.high];
    const other = ends
      .map((e) => categoryWith(bands, e))
      .filter((b): b is BandData => b !== null && b.key !== key)
      .map((b) => b.label);
    const crossed = other.length === 0 && placed ? crossedCutoffs(placed, ctx, ends) : [];
    if (other.length === 0 && crossed.length === 0) continue;
    const shown = [...read].flatMap((name) => bandEndWords(ctx, end, name));
    if (end.detail && end.detail.variables.some((name) => read.has(name))) shown.push(end.detail.words);
    const named = `the ${end.words}${shown.length ? ` (${shown.join("; ")})` : ""}`;
    parts.push(
      other.length > 0
        ? `${named} reaches ${unique(other).join(" and ")}`
        : `${named} crosses the cut-off ${crossed.join(" and ")} (same category at both ends)`,
    );
  }
  return parts.join("; ");
}

/**
 * The cut-offs of a band's condition that an end of an uncertainty band lies on the other side of, although the end
 * stays in the band: "VO2 at VT1 8.0 mL/kg/min". Comparisons are matched by position (the same condition is evaluated
 * in full at the value and at each end).
 */
function crossedCutoffs(band: BandData, ctx: EvalContext, ends: readonly EvalContext[]): string[] {
  const atValue = evaluateCondition(band.when, ctx).comparisons;
  const out: string[] = [];
  for (const e of ends) {
    if (categoryWith([band], e)?.key !== band.key) continue;
    evaluateCondition(band.when, e).comparisons.forEach((c, i) => {
      const v = atValue[i];
      if (!v || v.variable !== c.variable || typeof c.cutoff !== "number") return;
      if (v.outcome === null || c.outcome === null || v.outcome === c.outcome) return;
      const unit = variableInfo(c.variable).unit;
      out.push(`${variableLabel(ctx, c.variable)} ${formatCutoff(c.variable, c.cutoff)}${unit ? ` ${unit}` : ""}`);
    });
  }
  return unique(out);
}

/**
 * A variable the axis grades, at the two ends of a band that moves it, when the band's own words do not already give
 * it: ["VO2 at VT1 7.7–10.1 mL/kg/min"]; [] otherwise (the variable given by `detail` is said there).
 */
function bandEndWords(ctx: EvalContext, end: NonNullable<EvalContext["bandEnds"]>[number], name: string): string[] {
  if (end.detail?.variables.includes(name)) return [];
  const [lo, hi] = [end.low.vars[name], end.high.vars[name]];
  const info = variableInfo(name);
  if (typeof lo !== "number" || typeof hi !== "number" || info.kind !== "number") return [];
  if (lo === ctx.vars[name] && hi === ctx.vars[name]) return [];
  const range =
    formatValue(name, lo) === formatValue(name, hi)
      ? formatValue(name, lo)
      : `${formatValue(name, Math.min(lo, hi))}–${formatValue(name, Math.max(lo, hi))}`;
  if (end.words.includes(range)) return [];
  return [`${variableLabel(ctx, name)} ${range}${info.unit ? ` ${info.unit}` : ""}`];
}

function noCategoryReason(mode: string, axes: readonly SchemeAxisResult[]): string {
  const a = mode.startsWith("axis:") ? axes.find((x) => `axis:${x.axisId}` === mode) : undefined;
  if (a) return `${a.label}: ${a.reason ?? "not graded"}`;
  // an axis waiting on a yes/no answer says what each answer gives, without the "could not be placed" preamble
  const waiting = axes.filter((x) => x.inCombination && !x.category && x.dependsOn);
  if (waiting.length && waiting.length === axes.filter((x) => x.inCombination && !x.category).length)
    return waiting.map((x) => x.dependsOn).join("; ");
  const why = axes.filter((x) => x.inCombination && !x.category && x.reason).map((x) => `${x.label}: ${x.reason}`);
  return `none of the graded variables could be placed in a band${why.length ? ` (${why.join("; ")})` : ""}`;
}

/** The overall line of a scheme that grades each variable on its own and publishes no combined category. */
export const UNCOMBINED_SCHEME_TEXT = "Graded variable by variable (the scheme gives no combined category)";

/**
 * Apply the published schemes the referral question selects (schemes.json). Each axis shows the
 * patient's value, the band it falls in and its source; categories are neutral keys with an ordinal
 * severity (0 = best). Graph schemes (lung resection) return their path through the algorithm.
 */
export function applySchemes(
  ctx: EvalContext,
  effort: EffortResult,
  options: ApplySchemesOptions,
): { schemes: SchemeResult[]; issues: Issue[] } {
  const issues: Issue[] = [];
  const bandSets = new Map(ctx.data.schemes.bandSets.map((b) => [b.id, b.bands]));
  const schemes = selectSchemes(ctx, options).map((s): SchemeResult => {
    const uses: ChoiceUse[] = [];
    if (s.selectedBy) uses.push({ choiceId: s.selectedBy.choice, optionId: s.selectedBy.option });
    if (s.kind === "graph") {
      const path = runGraph(s.graph!, ctx);
      for (const st of path.steps) for (const c of st.checks) uses.push(...c.choicesUsed);
      const conflicts = path.steps.filter((st) => st.conflict);
      for (const st of conflicts)
        issues.push(
          makeIssue("warning", "scheme-criteria-conflict", `${s.name}, ${st.title}: ${st.conflict}.`, {
            field: `${s.id}.${st.nodeId}`,
          }),
        );
      const maxSeverity = Math.max(
        0,
        ...s.graph!.nodes.flatMap((n) => [...n.cases, n.otherwise, n.unknown]).map((b) => b.end?.severity ?? 0),
      );
      return {
        schemeId: s.id,
        name: s.name,
        sourceIds: s.sourceIds,
        status: s.status,
        kind: "graph",
        axes: [],
        path,
        overall: path.end ? { ...path.end, basis: "end of the algorithm" } : null,
        overallText: path.end
          ? `${path.end.label} (end of the algorithm)${conflicts.length ? `; criteria conflict at ${conflicts.map((st) => st.title).join(", ")}: reviewer decision required` : ""}`
          : "No overall result: the algorithm could not be followed to its end with the data given",
        maxSeverity,
        notes: s.notes ?? [],
        choicesUsed: dedupeUses(uses),
      };
    }
    const axes = s.axes!.map((a) => evaluateAxis(a, a.bands ?? bandSets.get(a.bandSet!)!, ctx, effort, uses, issues, s.id));
    const maxSeverity = Math.max(0, ...s.axes!.flatMap((a) => (a.bands ?? bandSets.get(a.bandSet!)!).map((b) => b.severity)));
    let overall: SchemeResult["overall"] = null;
    const comb = s.combination ?? { type: "none" as const };
    let mode: string | null = comb.type === "worst" ? "worst" : null;
    let basis = "worst of the graded variables";
    if (comb.type === "choice") {
      const opt = ctx.choices[comb.choice];
      uses.push({ choiceId: comb.choice, optionId: opt.id });
      mode = opt.mode!;
      basis = opt.label;
    }
    if (mode === "worst") {
      let worst: SchemeAxisResult | null = null;
      for (const a of axes)
        if (a.inCombination && a.category && (!worst || a.category.severity > worst.category!.severity)) worst = a;
      if (worst) overall = { ...worst.category!, basis: `${basis} (${worst.label})` };
    } else if (mode && mode.startsWith("axis:")) {
      const a = axes.find((x) => `axis:${x.axisId}` === mode);
      if (a?.category) overall = { ...a.category, basis };
    }
    return {
      schemeId: s.id,
      name: s.name,
      sourceIds: s.sourceIds,
      status: s.status,
      kind: "bands",
      axes,
      overall,
      ...(mode ? { overallMode: mode } : {}),
      overallText: overall
        ? `${overall.label} (${overall.basis})`
        : mode === null
          ? UNCOMBINED_SCHEME_TEXT
          : `No overall category: ${noCategoryReason(mode, axes)}`,
      maxSeverity,
      notes: s.notes ?? [],
      choicesUsed: dedupeUses(uses),
    };
  });
  return { schemes, issues };
}
