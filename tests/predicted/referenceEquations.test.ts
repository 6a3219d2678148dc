import fs from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { z } from "zod";
import {
  checkEquationFile,
  checkEquationSet,
  EQUATION_FILES,
  EQUATIONS,
  evaluateEquation,
  PREDICTED_SOURCES,
  walkExpr,
  type EquationCheckValue,
  type LabSettings,
  type ReferenceEquation,
} from "../../lib/predicted";

const DIR = path.resolve(__dirname, "../../reference-equations");
// Data files only: the schema itself and the interpretation rules folder (another layer's data) are not equations.
const dataFiles = fs
  .readdirSync(DIR)
  .filter((f) => f.endsWith(".json") && f !== "schema.json")
  .sort();
const readJson = (f: string): unknown => JSON.parse(fs.readFileSync(path.join(DIR, f), "utf8"));

function evaluateCheck(eq: ReferenceEquation, c: EquationCheckValue) {
  const { ergometer, fev1L, workPeakW, ...patient } = c.inputs;
  const labSettings = c.labSettings ? ({ equations: c.labSettings } as LabSettings) : undefined;
  return evaluateEquation(eq, { patient, ergometer, spirometry: { fev1L }, achieved: { workPeakW } }, { labSettings });
}

describe("reference-equations/ data files", () => {
  it("has at least the required equation sets", () => {
    const ids = EQUATIONS.map((e) => e.id);
    for (const id of [
      "hansen-1984",
      "jones-1985",
      "jones-1985-wmax",
      "jones-1985-hrmax",
      "jones-1985-o2pulse",
      "friend-2017",
      "friend-2018",
      "hrmax-220-age",
      "tanaka-2001",
      "ers-2019-hrmax-cycle",
      "ers-2019-hrmax-treadmill",
      "sun-2002",
      "o2pulse-derived",
      "mvv-fev1x40",
      "mvv-fev1x35",
    ]) {
      expect(ids).toContain(id);
    }
  });

  it("every file on disk is in the static index, named after its id, and vice versa", () => {
    const indexed = EQUATION_FILES.map((f) => `${(f as { id: string }).id}.json`).sort();
    expect(indexed).toEqual(dataFiles);
  });

  it.each(dataFiles)("%s passes the zod schema and the cross-field rules", (file) => {
    const check = checkEquationFile(readJson(file));
    expect(check.problems).toEqual([]);
    expect(check.equation?.source.authors.length).toBeGreaterThan(0);
    expect(check.equation?.checkValues.length).toBeGreaterThan(0);
  });

  it("the set has unique ids, known reference targets and no cycles", () => {
    expect(checkEquationSet(EQUATIONS)).toEqual([]);
  });

  it("every equation is registered as a source with its citation and evidence status", () => {
    for (const eq of EQUATIONS) {
      const src = PREDICTED_SOURCES[eq.id];
      expect(src.status).toBe(eq.status);
      expect(src.citation).toContain(String(eq.source.year));
      expect(src.citation).toContain(eq.source.journal);
    }
  });
});

describe("check values (published worked examples, reproduced tables, hand calculations)", () => {
  const cases = EQUATIONS.flatMap((eq) => eq.checkValues.map((c, i) => ({ name: `${eq.id} #${i + 1}`, eq, c })));
  it.each(cases)("$name", ({ eq, c }) => {
    // Each check names its origin (worked example / hand calculation with the arithmetic).
    expect(c.origin).toMatch(/worked example|hand calculation|clinical-reference/i);
    const r = evaluateCheck(eq, c);
    expect(r.value).not.toBeNull();
    expect(Math.abs((r.value as number) - c.expected)).toBeLessThanOrEqual(c.tolerance);
    if (c.expectedLln !== undefined) expect(Math.abs((r.lln as number) - c.expectedLln)).toBeLessThanOrEqual(c.tolerance);
    expect(r.equationId).toBe(eq.id);
  });
});

describe("weight rules: every branch of every three-way rule is exercised by a check value", () => {
  const withRules = EQUATIONS.filter((eq) => {
    let found = false;
    walkExpr(eq.form, (n) => {
      if ("compare" in n) found = true;
    });
    return found;
  });

  it("hansen-1984 has weight rules", () => {
    expect(withRules.map((e) => e.id)).toContain("hansen-1984");
  });

  it.each(withRules.map((eq) => ({ id: eq.id, eq })))("$id: equal, greater and less for every rule", ({ eq }) => {
    const labels = new Set<string>();
    walkExpr(eq.form, (n) => {
      if ("compare" in n) labels.add(n.compare.label);
    });
    const seen = new Map<string, Set<string>>();
    for (const c of eq.checkValues) {
      for (const s of evaluateCheck(eq, c).steps) {
        if (s.branch && labels.has(s.label)) seen.set(s.label, (seen.get(s.label) ?? new Set()).add(s.branch));
      }
    }
    for (const label of labels) expect([...(seen.get(label) ?? [])].sort()).toEqual(["equal", "greater", "less"]);
  });

  // The same six branches written out by hand (Hansen, Sue & Wasserman 1984 weight rules as reproduced
  // in JAHA 2020;9:e015117 Table 1, secondary; overweight men with PW — see the file's conflict note).
  const hansen = (sex: "male" | "female", ageY: number, heightCm: number, weightKg: number) =>
    evaluateEquation("hansen-1984", { patient: { sex, ageY, heightCm, weightKg }, ergometer: "cycle" });
  it("men: W = PW → W·F; W > PW → PW·F + 6(W − PW); W < PW → ((PW + W)/2)·F", () => {
    // PW = 0.79·180 − 60.7 = 81.5; F = 50.72 − 0.372·40 = 35.84
    expect(hansen("male", 40, 180, 81.5).value).toBeCloseTo(81.5 * 35.84, 6); // 2920.96
    expect(hansen("male", 40, 180, 95).value).toBeCloseTo(81.5 * 35.84 + 6 * 13.5, 6); // 2920.96 + 81 = 3001.96
    expect(hansen("male", 40, 180, 70).value).toBeCloseTo(((81.5 + 70) / 2) * 35.84, 6); // 75.75·35.84 = 2714.88
  });
  it("women: W = PW → (W + 43)·F; W > PW → (PW + 43)·F + 6(W − PW); W < PW → ((PW + W + 86)/2)·F", () => {
    // PW = 0.65·170 − 42.8 = 67.7; F = 22.78 − 0.17·30 = 17.68
    expect(hansen("female", 30, 170, 67.7).value).toBeCloseTo((67.7 + 43) * 17.68, 6); // 1957.176
    expect(hansen("female", 30, 170, 90).value).toBeCloseTo((67.7 + 43) * 17.68 + 6 * 22.3, 6); // 1957.176 + 133.8
    expect(hansen("female", 30, 170, 55).value).toBeCloseTo(((67.7 + 55 + 86) / 2) * 17.68, 6); // 104.35·17.68 = 1844.908
  });
  it("the JAHA-literal overweight-men variant (W instead of PW) is not what is computed", () => {
    // Literal: 80·32.12 + 6·2.45 = 2569.6 + 14.7 = 2584.3; implemented: 2505.606 (clinical-reference §1.2).
    const v = hansen("male", 50, 175, 80).value as number;
    expect(v).toBeCloseTo(2505.606, 3);
    expect(Math.abs(v - 2584.3)).toBeGreaterThan(70);
  });
});

describe("a data file without source or check values is refused", () => {
  const good = readJson("hansen-1984.json") as Record<string, unknown>;
  it("accepts the good file", () => expect(checkEquationFile(good).problems).toEqual([]));
  it("refuses a file with no source", () => {
    const { source: _s, ...noSource } = good;
    expect(checkEquationFile(noSource).problems.join("\n")).toMatch(/source/);
  });
  it("refuses a file with an empty check-value list or none", () => {
    expect(checkEquationFile({ ...good, checkValues: [] }).problems.join("\n")).toMatch(/checkValues/);
    const { checkValues: _c, ...noChecks } = good;
    expect(checkEquationFile(noChecks).problems.join("\n")).toMatch(/checkValues/);
  });
  it("refuses code in a string where a form node belongs", () => {
    expect(checkEquationFile({ ...good, form: "50.72 - 0.372*A" }).problems.length).toBeGreaterThan(0);
    expect(checkEquationFile({ ...good, form: { eval: "W*F" } }).problems.length).toBeGreaterThan(0);
  });
  it("refuses a name that is neither a predictor nor defined", () => {
    const bad = { ...good, form: { linear: { intercept: 1, terms: [{ coef: 1, vars: ["Q"] }] } } };
    expect(checkEquationFile(bad).problems.join("\n")).toMatch(/name Q/);
  });
  it("refuses a unit that is not the quantity's unit", () => {
    expect(checkEquationFile({ ...good, unit: "L/min" }).problems.join("\n")).toMatch(/unit/);
  });
  it("refuses a categorical predictor without a code for a population sex", () => {
    const jones = readJson("jones-1985.json") as ReferenceEquation;
    const bad = { ...jones, predictors: jones.predictors.map((p) => (p.from === "sex" ? { ...p, coding: { male: 0 } } : p)) };
    expect(checkEquationFile(bad).problems.join("\n")).toMatch(/no code for female/);
  });
});

describe("reference-equations/schema.json says the same as the zod schema", () => {
  const schema = readJson("schema.json") as Record<string, unknown>;
  // zod's JSON-Schema reader does not combine a root anyOf with strict properties, so the
  // quantity–unit pairs (root anyOf) and the rest are checked as two schemas.
  const { anyOf, ...base } = schema;
  const structural = z.fromJSONSchema(base as Parameters<typeof z.fromJSONSchema>[0]);
  const unitPairs = z.fromJSONSchema({ anyOf } as Parameters<typeof z.fromJSONSchema>[0]);
  const jsonSchemaAccepts = (x: unknown) => structural.safeParse(x).success && unitPairs.safeParse(x).success;
  const zodAccepts = (x: unknown) => checkEquationFile(x).equation !== undefined;

  it.each(dataFiles)("JSON Schema accepts %s", (file) => {
    expect(jsonSchemaAccepts(readJson(file))).toBe(true);
  });

  const good = readJson("hansen-1984.json") as Record<string, unknown>;
  const mutations: [string, unknown][] = [
    ["no source", { ...good, source: undefined }],
    ["no check values", { ...good, checkValues: [] }],
    ["unknown top-level key", { ...good, extra: 1 }],
    ["unknown kind", { ...good, kind: "guess" }],
    ["unit of another quantity", { ...good, unit: "W" }],
    ["string form", { ...good, form: "W*F" }],
    ["unknown node", { ...good, form: { power: [{ const: 2 }] } }],
    ["difference of three", { ...good, form: { difference: [{ const: 1 }, { const: 2 }, { const: 3 }] } }],
    ["byErgometer with rowing", { ...good, form: { byErgometer: { rowing: { const: 1 } } } }],
    [
      "compare without a branch",
      {
        ...good,
        form: {
          compare: {
            label: "x",
            left: { const: 1 },
            right: { const: 1 },
            equalWithin: 0,
            equal: { const: 1 },
            greater: { const: 1 },
          },
        },
      },
    ],
    ["short origin", { ...good, checkValues: [{ inputs: { ergometer: "cycle" }, expected: 1, tolerance: 1, origin: "memory" }] }],
    [
      "zero tolerance",
      {
        ...good,
        checkValues: [{ inputs: { ergometer: "cycle" }, expected: 1, tolerance: 0, origin: "a hand calculation written out" }],
      },
    ],
    ["SEE lln without z", { ...good, lln: { method: "see", see: 1, unit: "mL/min", label: "x" } }],
    ["bad id", { ...good, id: "Hansen 1984" }],
  ];
  it.each(mutations)("both refuse: %s", (_name, bad) => {
    expect(zodAccepts(bad)).toBe(false);
    expect(jsonSchemaAccepts(bad)).toBe(false);
  });
});
