import { describe, it, expect } from "vitest";
import { spo2 } from "../../lib/thresholds/spo2";
import { buildRows, EX_START_S, freezeTest, makeTest, standardRamp } from "./indicesFixture";

const verdicts = (r: ReturnType<typeof spo2>) => Object.fromEntries(r.byDefinition.map((d) => [d.id, d.met]));
// Invented: SpO2 constant at rest, then linear fall to a chosen value at the end of exercise.
function falling(rest: number, endValue: number) {
  return makeTest(
    buildRows((t, phase) => ({ spo2Pct: phase === "exercise" ? rest + ((endValue - rest) * (t - EX_START_S)) / 600 : rest })),
  );
}

// Desaturation definitions under test (lib source ids in brackets; they differ, so all three are checked):
// - fall ≥ 4 % from rest: Hadeli KO et al., Chest 2001;120:88 — confirmed ["hadeli-2001"];
// - fall > 4 % to below 90 %: COPD study in Respiration 2012;84:353 (PMID 22269699; authors not recorded in the
//   sources registry) — confirmed ["respiration-2012-desaturation"];
// - nadir ≤ 88 %: Andrianopoulos V et al., Respir Physiol Neurobiol 2014 — confirmed ["andrianopoulos-2014"].
// Resting SpO2 = mean of the last 60 s of rest and lowest = lowest 30-s rolling mean in exercise: the lib defaults,
// our choice ["implementation-choice"].
describe("SpO2 and desaturation", () => {
  it("standard ramp: rest 97, lowest 91.15, fall 5.85 → Hadeli yes, Respiration 2012 no (not < 90), nadir ≤ 88 no (definitions and sources above)", () => {
    const r = spo2(freezeTest(standardRamp()));
    expect(r.restPct.value).toBeCloseTo(97, 9);
    expect(r.lowestPct.value).toBeCloseTo(91.15, 9);
    expect(r.fallPct.value).toBeCloseTo(5.85, 9);
    expect(verdicts(r)).toEqual({ "hadeli-2001": true, "respiration-2012": false, "andrianopoulos-2014": false });
    expect(r.desaturation).toBe(true);
  });

  it("boundary: a fall of exactly 4 meets Hadeli 2001 (Chest, confirmed: ≥ 4) but not Respiration 2012 (confirmed: > 4)", () => {
    // constant values: rest 93, exercise 89 → fall 4 exactly
    const t = makeTest(buildRows((_t, phase) => ({ spo2Pct: phase === "rest" ? 93 : 89 })));
    const r = spo2(t);
    expect(r.fallPct.value).toBe(4);
    expect(verdicts(r)).toEqual({ "hadeli-2001": true, "respiration-2012": false, "andrianopoulos-2014": false });
  });

  it("boundary: nadir exactly 88 meets Andrianopoulos 2014 (Respir Physiol Neurobiol, confirmed: ≤ 88)", () => {
    const t = makeTest(buildRows((_t, phase) => ({ spo2Pct: phase === "rest" ? 90 : 88 })));
    const r = spo2(t, { definition: "andrianopoulos-2014" });
    expect(r.desaturation).toBe(true);
    expect(verdicts(r)["hadeli-2001"]).toBe(false);
  });

  it("fall > 4 to below 90 meets Respiration 2012 (confirmed)", () => {
    // lowest 30-s window 750–780 s, a linear fall, so its mean is the value at 765 s = 585 s into the 600-s ramp:
    // 96 − 7·585/600 = 89.175 → fall 6.825
    const r = spo2(falling(96, 89));
    expect(r.lowestPct.value).toBeCloseTo(96 - (7 * 585) / 600, 9);
    expect(verdicts(r)["respiration-2012"]).toBe(true);
  });

  it("no SpO2 → not assessable", () => {
    const r = spo2(makeTest(buildRows(() => ({ hrBpm: 100 }))));
    expect(r.desaturation).toBeNull();
    expect(r.issues.map((i) => i.code)).toContain("no-spo2");
  });
});
