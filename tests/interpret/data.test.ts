import { describe, expect, it } from "vitest";
import { INTERPRETATION_DATA, listCutoffChoices, parseInterpretationData, VARIABLES } from "../../lib/interpret";
import choices from "../../reference-equations/interpretation/choices.json";
import rules from "../../reference-equations/interpretation/rules.json";
import derived from "../../reference-equations/interpretation/derived.json";
import effort from "../../reference-equations/interpretation/effort.json";
import flow from "../../reference-equations/interpretation/flow.json";
import patterns from "../../reference-equations/interpretation/patterns.json";
import schemes from "../../reference-equations/interpretation/schemes.json";
import variability from "../../reference-equations/interpretation/variability.json";

// the statuses of lib/core/source.ts: "our-choice" marks a setting of this software that no source fixes
const STATUSES = ["confirmed", "secondary", "recalled", "common-practice", "our-choice"];
const raw = { choices, rules, derived, effort, flow, patterns, schemes, variability };

describe("interpretation data files", () => {
  const d = INTERPRETATION_DATA;
  const cited: { where: string; sourceIds: string[]; status: string }[] = [
    ...d.rules.map((r) => ({ where: `rule ${r.id}`, ...r })),
    ...d.choices.flatMap((c) => c.options.map((o) => ({ where: `choice ${c.id}.${o.id}`, ...o }))),
    ...d.derived.map((x) => ({ where: `derived ${x.id}`, ...x })),
    ...d.effort.verdicts.map((v) => ({ where: `effort ${v.key}`, ...v })),
    { where: "flow", ...d.flow },
    ...d.flow.graph.nodes.map((n) => ({ where: `flow node ${n.id}`, ...n })),
    ...d.patterns.patterns.map((p) => ({ where: `pattern ${p.id}`, ...p })),
    ...d.schemes.bandSets.flatMap((b) => b.bands.map((x) => ({ where: `band set ${b.id}.${x.key}`, ...x }))),
    ...d.schemes.schemes.map((s) => ({ where: `scheme ${s.id}`, ...s })),
    ...d.schemes.schemes.flatMap((s) => (s.axes ?? []).map((a) => ({ where: `axis ${s.id}.${a.id}`, ...a }))),
    ...d.schemes.schemes.flatMap((s) =>
      (s.axes ?? []).flatMap((a) => (a.bands ?? []).map((b) => ({ where: `band ${s.id}.${a.id}.${b.key}`, ...b }))),
    ),
    ...d.schemes.schemes.flatMap((s) => (s.graph?.nodes ?? []).map((n) => ({ where: `node ${s.id}.${n.id}`, ...n }))),
    ...d.variability.entries.map((e) => ({ where: `variability ${e.id}`, ...e })),
  ];

  it("every rule, node, band, pattern, choice option and variability entry has a registered source and an evidence status", () => {
    expect(cited.length).toBeGreaterThan(150);
    for (const c of cited) {
      expect(c.sourceIds.length, c.where).toBeGreaterThan(0);
      for (const id of c.sourceIds) expect(d.sources[id], `${c.where} cites ${id}`).toBeDefined();
      expect(STATUSES, c.where).toContain(c.status);
    }
    for (const s of Object.values(d.sources)) {
      expect(s.citation.length).toBeGreaterThan(10);
      expect(STATUSES).toContain(s.status);
    }
  });

  it("rules name only known variables and every cut-off choice has its default among its options", () => {
    const json = JSON.stringify(raw);
    for (const m of json.matchAll(/"var":\s*"([A-Za-z0-9]+)"/g)) expect(Object.keys(VARIABLES)).toContain(m[1]);
    for (const c of listCutoffChoices()) expect(c.options.map((o) => o.id)).toContain(c.defaultOptionId);
  });

  it("lists the disputed cut-offs of clinical-reference §7 as choices", () => {
    const ids = listCutoffChoices().map((c) => c.id);
    for (const id of [
      "peak-vo2-normal",
      "rer-maximal",
      "breathing-reserve",
      "arena-vc1",
      "ph-risk-version",
      "desaturation",
      "vevco2-slope-definition",
    ]) {
      expect(ids).toContain(id);
    }
  });

  it("refuses data with an unknown rule reference, an unknown source, or a cycle", () => {
    const badRule = structuredClone(raw);
    badRule.flow.graph.nodes[0].checks = ["no-such-rule"];
    expect(() => parseInterpretationData(badRule)).toThrow(/unknown rule no-such-rule/);

    const badSource = structuredClone(raw);
    badSource.rules.rules[0].sourceIds = ["nobody-2099"];
    expect(() => parseInterpretationData(badSource)).toThrow(/unknown source nobody-2099/);

    const cycle = structuredClone(raw);
    const n = cycle.flow.graph.nodes.find((x) => x.id === "gas-exchange")!;
    (n.otherwise as { next?: string }).next = "effort";
    expect(() => parseInterpretationData(cycle)).toThrow(/cycle/);

    const noStatus = structuredClone(raw) as unknown as { rules: { rules: Record<string, unknown>[] } };
    delete noStatus.rules.rules[0].status;
    expect(() => parseInterpretationData(noStatus as unknown as typeof raw)).toThrow(/rules.json is invalid/);
  });
});
