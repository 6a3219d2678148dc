import { CORE_SOURCES } from "../core/sources";
import { mergeSourceRegistries, type Source } from "../core/source";
import choicesJson from "../../reference-equations/interpretation/choices.json";
import rulesJson from "../../reference-equations/interpretation/rules.json";
import derivedJson from "../../reference-equations/interpretation/derived.json";
import effortJson from "../../reference-equations/interpretation/effort.json";
import flowJson from "../../reference-equations/interpretation/flow.json";
import patternsJson from "../../reference-equations/interpretation/patterns.json";
import schemesJson from "../../reference-equations/interpretation/schemes.json";
import variabilityJson from "../../reference-equations/interpretation/variability.json";
import {
  ChoicesFileSchema,
  DerivedFileSchema,
  EffortFileSchema,
  FlowFileSchema,
  PatternsFileSchema,
  RulesFileSchema,
  SchemesFileSchema,
  VariabilityFileSchema,
  type ChoiceData,
  type Condition,
  type DerivedData,
  type EffortData,
  type Expr,
  type FlowData,
  type GraphData,
  type PatternsData,
  type RuleData,
  type SchemesData,
  type VariabilityData,
} from "./schema";
import { INTERPRET_SOURCES } from "./sources";

/** All interpretation data, validated and cross-checked, with lookup maps. */
export interface InterpretationData {
  choices: ChoiceData[];
  choiceById: Map<string, ChoiceData>;
  rules: RuleData[];
  ruleById: Map<string, RuleData>;
  derived: DerivedData[];
  effort: EffortData;
  flow: FlowData;
  patterns: PatternsData;
  schemes: SchemesData;
  variability: VariabilityData;
  sources: Record<string, Source>;
}

export interface RawInterpretationData {
  choices: unknown;
  rules: unknown;
  derived: unknown;
  effort: unknown;
  flow: unknown;
  patterns: unknown;
  schemes: unknown;
  variability: unknown;
}

function parse<T>(
  schema: { safeParse(x: unknown): { success: true; data: T } | { success: false; error: { message: string } } },
  raw: unknown,
  file: string,
): T {
  const r = schema.safeParse(raw);
  if (!r.success) throw new Error(`interpretation data ${file} is invalid: ${r.error.message}`);
  return r.data;
}

/**
 * Validate the data files with zod, then check every cross-reference (rule, choice, node, band set
 * and source ids; graph targets; acyclic graphs). Bad data is a programming mistake and throws with
 * the file and id at fault.
 */
export function parseInterpretationData(raw: RawInterpretationData): InterpretationData {
  const choices = parse(ChoicesFileSchema, raw.choices, "choices.json").choices;
  const rules = parse(RulesFileSchema, raw.rules, "rules.json").rules;
  const derived = parse(DerivedFileSchema, raw.derived, "derived.json").derived;
  const effort = parse(EffortFileSchema, raw.effort, "effort.json");
  const flow = parse(FlowFileSchema, raw.flow, "flow.json");
  const patterns = parse(PatternsFileSchema, raw.patterns, "patterns.json");
  const schemes = parse(SchemesFileSchema, raw.schemes, "schemes.json");
  const variability = parse(VariabilityFileSchema, raw.variability, "variability.json");
  const sources = mergeSourceRegistries(CORE_SOURCES, INTERPRET_SOURCES);

  const fail = (msg: string): never => {
    throw new Error(`interpretation data: ${msg}`);
  };
  const unique = <T extends { id: string }>(items: T[], what: string) => {
    const m = new Map<string, T>();
    for (const it of items) {
      if (m.has(it.id)) fail(`duplicate ${what} id ${it.id}`);
      m.set(it.id, it);
    }
    return m;
  };
  const choiceById = unique(choices, "choice");
  const ruleById = unique(rules, "rule");
  unique(schemes.schemes, "scheme");
  unique(schemes.bandSets, "band set");
  unique(patterns.patterns, "pattern");
  unique(variability.entries, "variability entry");

  const checkSources = (ids: string[], where: string) => {
    for (const id of ids) if (!sources[id]) fail(`${where} cites unknown source ${id}`);
  };

  for (const c of choices) {
    unique(c.options, `option of choice ${c.id}`);
    if (!c.options.some((o) => o.id === c.default)) fail(`choice ${c.id} default ${c.default} is not an option`);
    for (const o of c.options) checkSources(o.sourceIds, `choice ${c.id} option ${o.id}`);
  }

  const checkChoiceKind = (id: string, kind: "value" | "condition" | "variable" | "mode", where: string) => {
    const c = choiceById.get(id) ?? fail(`${where} references unknown choice ${id}`);
    for (const o of c.options) if (o[kind] === undefined) fail(`${where}: choice ${id} option ${o.id} has no ${kind}`);
  };

  const checkCondition = (cond: Condition, where: string): void => {
    if ("rule" in cond) {
      if (!ruleById.has(cond.rule)) fail(`${where} references unknown rule ${cond.rule}`);
    } else if ("choice" in cond) checkChoiceKind(cond.choice, "condition", where);
    else if ("all" in cond) cond.all.forEach((c) => checkCondition(c, where));
    else if ("any" in cond) cond.any.forEach((c) => checkCondition(c, where));
    else if ("not" in cond) checkCondition(cond.not, where);
    else if ("notTrue" in cond) checkCondition(cond.notTrue, where);
    else if ("atLeast" in cond) {
      if (cond.atLeast > cond.of.length) fail(`${where}: atLeast ${cond.atLeast} of ${cond.of.length}`);
      cond.of.forEach((c) => checkCondition(c, where));
    } else {
      if (typeof cond.var === "object") checkChoiceKind(cond.var.choice, "variable", where);
      if ("value" in cond && typeof cond.value === "object") checkChoiceKind(cond.value.choice, "value", where);
    }
  };

  for (const c of choices)
    for (const o of c.options) if (o.condition) checkCondition(o.condition, `choice ${c.id} option ${o.id}`);
  for (const r of rules) {
    checkCondition(r.when, `rule ${r.id}`);
    checkSources(r.sourceIds, `rule ${r.id}`);
  }
  // rules may reference rules: refuse cycles
  const ruleRefs = (cond: Condition, out: string[]): string[] => {
    if ("rule" in cond) out.push(cond.rule);
    else if ("all" in cond) cond.all.forEach((c) => ruleRefs(c, out));
    else if ("any" in cond) cond.any.forEach((c) => ruleRefs(c, out));
    else if ("not" in cond) ruleRefs(cond.not, out);
    else if ("notTrue" in cond) ruleRefs(cond.notTrue, out);
    else if ("atLeast" in cond) cond.of.forEach((c) => ruleRefs(c, out));
    return out;
  };
  const visiting = new Set<string>();
  const done = new Set<string>();
  const visitRule = (id: string) => {
    if (done.has(id)) return;
    if (visiting.has(id)) fail(`rule ${id} references itself through other rules`);
    visiting.add(id);
    for (const ref of ruleRefs(ruleById.get(id)!.when, [])) visitRule(ref);
    visiting.delete(id);
    done.add(id);
  };
  rules.forEach((r) => visitRule(r.id));

  const exprVars = (e: Expr, where: string): void => {
    if ("mul" in e) e.mul.forEach((x) => exprVars(x, where));
    else if ("div" in e) e.div.forEach((x) => exprVars(x, where));
    else if ("sub" in e) e.sub.forEach((x) => exprVars(x, where));
  };
  for (const d of derived) {
    exprVars(d.expr, `derived ${d.id}`);
    checkSources(d.sourceIds, `derived ${d.id}`);
  }

  for (const id of effort.criteria) if (!ruleById.has(id)) fail(`effort criterion ${id} is not a rule`);
  for (const v of effort.verdicts) {
    checkCondition(v.when, `effort verdict ${v.key}`);
    checkSources(v.sourceIds, `effort verdict ${v.key}`);
  }

  const checkGraph = (g: GraphData, where: string) => {
    const nodes = unique(g.nodes, `${where} node`);
    if (!nodes.has(g.start)) fail(`${where} start node ${g.start} missing`);
    for (const n of g.nodes) {
      const at = `${where} node ${n.id}`;
      checkSources(n.sourceIds, at);
      for (const c of n.checks) if (!ruleById.has(c)) fail(`${at} checks unknown rule ${c}`);
      for (const b of [...n.cases, n.otherwise, n.unknown]) {
        if (b.next && !nodes.has(b.next)) fail(`${at} branches to unknown node ${b.next}`);
        if (b.next && b.end) fail(`${at} branch ${b.outcome} has both next and end`);
      }
      n.cases.forEach((c) => checkCondition(c.when, at));
    }
    const state = new Map<string, 1 | 2>();
    const dfs = (id: string) => {
      if (state.get(id) === 2) return;
      if (state.get(id) === 1) fail(`${where} has a cycle through node ${id}`);
      state.set(id, 1);
      const n = nodes.get(id)!;
      for (const b of [...n.cases, n.otherwise, n.unknown]) if (b.next) dfs(b.next);
      state.set(id, 2);
    };
    dfs(g.start);
  };
  checkSources(flow.sourceIds, "flow");
  checkGraph(flow.graph, "flow");

  for (const p of patterns.patterns) {
    checkSources(p.sourceIds, `pattern ${p.id}`);
    for (const f of p.features) if (!ruleById.has(f.rule)) fail(`pattern ${p.id} feature references unknown rule ${f.rule}`);
  }

  const bandSetIds = new Set(schemes.bandSets.map((b) => b.id));
  for (const bs of schemes.bandSets) {
    for (const b of bs.bands) {
      checkCondition(b.when, `band set ${bs.id} band ${b.key}`);
      checkSources(b.sourceIds, `band set ${bs.id} band ${b.key}`);
    }
  }
  for (const s of schemes.schemes) {
    const at = `scheme ${s.id}`;
    checkSources(s.sourceIds, at);
    if (s.selectedBy) {
      const c = choiceById.get(s.selectedBy.choice) ?? fail(`${at} selectedBy unknown choice ${s.selectedBy.choice}`);
      if (!c.options.some((o) => o.id === s.selectedBy!.option)) fail(`${at} selectedBy unknown option ${s.selectedBy.option}`);
    }
    if (s.kind === "graph") {
      if (!s.graph) fail(`${at} is a graph scheme without a graph`);
      checkGraph(s.graph!, at);
    } else {
      if (!s.axes || s.axes.length === 0) fail(`${at} is a bands scheme without axes`);
      for (const a of s.axes!) {
        const aat = `${at} axis ${a.id}`;
        checkSources(a.sourceIds, aat);
        if (Boolean(a.bands) === Boolean(a.bandSet)) fail(`${aat} needs exactly one of bands or bandSet`);
        if (a.bandSet && !bandSetIds.has(a.bandSet)) fail(`${aat} references unknown band set ${a.bandSet}`);
        if (a.appliesWhen) checkCondition(a.appliesWhen, aat);
        for (const b of a.bands ?? []) {
          checkCondition(b.when, `${aat} band ${b.key}`);
          checkSources(b.sourceIds, `${aat} band ${b.key}`);
        }
      }
      const comb = s.combination ?? { type: "none" as const };
      if (comb.type === "choice") {
        checkChoiceKind(comb.choice, "mode", at);
        for (const o of choiceById.get(comb.choice)!.options) {
          const mode = o.mode!;
          if (mode !== "worst" && !(mode.startsWith("axis:") && s.axes!.some((a) => `axis:${a.id}` === mode))) {
            fail(`${at} combination mode ${mode} names no axis`);
          }
        }
      }
    }
  }

  const popIds = new Set(variability.populations.map((p) => p.id));
  for (const e of variability.entries) {
    if (!popIds.has(e.population)) fail(`variability ${e.id} has unknown population ${e.population}`);
    checkSources(e.sourceIds, `variability ${e.id}`);
  }

  return { choices, choiceById, rules, ruleById, derived, effort, flow, patterns, schemes, variability, sources };
}

/** The shipped interpretation data (reference-equations/interpretation/*.json), validated at load. */
export const INTERPRETATION_DATA: InterpretationData = parseInterpretationData({
  choices: choicesJson,
  rules: rulesJson,
  derived: derivedJson,
  effort: effortJson,
  flow: flowJson,
  patterns: patternsJson,
  schemes: schemesJson,
  variability: variabilityJson,
});
