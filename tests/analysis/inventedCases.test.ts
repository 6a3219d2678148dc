/**
 * End-to-end: six INVENTED cases (tests/fixtures/cases, made by the synthetic generator from its
 * presets, see scripts/make-case-fixtures.ts) go through import → analyse → interpret. Each must
 * give the path, patterns and scheme results a clinical physiologist would accept. The expected
 * readings follow the pattern table of the ATS/ACCP 2003 statement and the Wasserman textbook
 * (recalled, clinical-reference.md §4.2) and its corroboration in the CCJM table (secondary), and
 * the scheme cut-offs cited in reference-equations/interpretation.
 */
import fs from "node:fs";
import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { analyse, buildRecord, type AnalysisResult } from "../../lib/analysis";

const dir = path.resolve(__dirname, "../fixtures/cases");
const results = new Map<string, AnalysisResult>();

beforeAll(async () => {
  for (const f of fs.readdirSync(dir).filter((x) => x.endsWith(".json"))) {
    const id = f.replace(/\.json$/, "");
    const meta = JSON.parse(fs.readFileSync(path.join(dir, f), "utf8"));
    expect(meta.invented).toBe(true);
    const bytes = new Uint8Array(fs.readFileSync(path.join(dir, `${id}.csv`)));
    const built = await buildRecord({
      bytes,
      fileName: `${id}.csv`,
      patient: meta.patient,
      ergometer: meta.ergometer,
      referral: meta.referral,
    });
    expect(built.record, `${id} imports`).not.toBeNull();
    const record = { ...built.record!, spirometry: meta.spirometry, conduct: meta.conduct, context: meta.context };
    results.set(id, analyse(record));
  }
}, 60_000);

const step = (r: AnalysisResult, node: string) => r.interpretation.path.steps.find((s) => s.nodeId === node)?.outcome;
const top = (r: AnalysisResult) => r.interpretation.patterns[0];
const scheme = (r: AnalysisResult, id: string) => r.interpretation.schemes.find((s) => s.schemeId === id);
const supported = (r: AnalysisResult) =>
  r.interpretation.patterns.filter((p) => p.support === "strong" || p.support === "moderate").map((p) => p.patternId);

describe("six invented cases, end to end", () => {
  it("loads all six", () => {
    expect([...results.keys()].sort()).toEqual([
      "deconditioning",
      "heart-failure",
      "normal-adult",
      "preop-low-at",
      "pulmonary-vascular",
      "ventilatory-limitation",
    ]);
  });

  it("normal study: maximal effort, normal peak VO2, no limitation pattern", () => {
    const r = results.get("normal-adult")!;
    expect(r.interpretation.effort.verdict).toBe("maximal");
    expect(step(r, "peak-vo2")).toBe("normal");
    expect(r.interpretation.path.end?.key).toBe("normal");
    expect(supported(r)).toEqual([]);
    expect(r.interpretInput.values.peakVo2PctPred!).toBeGreaterThanOrEqual(85); // ≥85 % predicted normal (Respir Res 2021 practical guide, secondary)
  });

  it("heart failure: reduced peak VO2 and AT, cardiovascular pattern first, Weber C or D, ventilatory class III or IV", () => {
    const r = results.get("heart-failure")!;
    expect(step(r, "peak-vo2")).toBe("reduced");
    expect(step(r, "at")).toBe("low");
    expect(step(r, "cardiovascular")).toBe("abnormal");
    expect(top(r).patternId).toBe("cardiovascular");
    expect(["C", "D"]).toContain(scheme(r, "weber")?.overall?.key); // Weber classes (Janicki, Weber & McElroy 1988, confirmed)
    expect(["VC-III", "VC-IV"]).toContain(scheme(r, "arena-ventilatory-class")?.overall?.key); // Arena 2007 (confirmed)
    expect(r.interpretInput.values.eovPresent).toBe(true);
  });

  it("ventilatory limitation: breathing reserve exhausted, ventilatory pattern first", () => {
    const r = results.get("ventilatory-limitation")!;
    expect(step(r, "breathing-reserve")).toBe("ventilatory-limitation");
    expect(r.interpretInput.values.veMvvPct!).toBeGreaterThanOrEqual(85); // VE/MVV ≥85 % (ERS 2019, confirmed)
    expect(top(r).patternId).toBe("ventilatory");
  });

  it("pulmonary vascular: high VE/VCO2 slope, low PETCO2, desaturation, pulmonary vascular pattern first, PH slope axis high risk", () => {
    const r = results.get("pulmonary-vascular")!;
    expect(step(r, "gas-exchange")).toBe("abnormal");
    expect(top(r).patternId).toBe("pulmonary-vascular");
    const ph = scheme(r, "ph-esc-ers-2015")!;
    const slopeAxis = ph.axes.find((a) => /VE\/VCO2/.test(a.label));
    expect(slopeAxis?.category?.severity).toBe(2); // ≥45 high risk (ESC/ERS 2015, confirmed)
  });

  it("deconditioning: reduced peak VO2 with low AT, preserved breathing reserve and gas exchange, deconditioning pattern first", () => {
    const r = results.get("deconditioning")!;
    expect(step(r, "peak-vo2")).toBe("reduced");
    expect(step(r, "breathing-reserve")).toBe("preserved");
    expect(step(r, "gas-exchange")).toBe("normal");
    expect(top(r).patternId).toBe("deconditioning");
  });

  it("pre-operative low AT: AT below 11 mL/kg/min (Older 1993), higher-risk tier in the published three-tier scheme", () => {
    const r = results.get("preop-low-at")!;
    expect(r.interpretInput.values.vt1Vo2MlKgMin!).toBeLessThan(11);
    const older = scheme(r, "preop-older-1993")!;
    expect(older.overall?.severity).toBeGreaterThan(0);
    expect(["high", "intermediate"]).toContain(scheme(r, "preop-three-tier")?.overall?.key);
  });

  it("every draft is marked DRAFT and carries the clinical caution", () => {
    for (const r of results.values()) {
      expect(r.draft.status).toBe("draft");
      expect(r.draft.banner).toMatch(/DRAFT/);
      expect(r.draft.caution).toMatch(/qualified clinician/);
    }
  });
});
