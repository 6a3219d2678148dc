/**
 * A sustained fall of VO2 during incremental exercise is found and said (`vo2-falls-in-exercise`): checked on invented
 * tests with a fall put in by construction, on invented tests without one, and on the open ACTES recordings.
 */
import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { importBreathFile, type BreathTable } from "../../lib/breath";
import { conditionTable, findVo2Fall, VO2_FALL_MIN_FRACTION } from "../../lib/signal";
import { generateSyntheticTest, syntheticBank } from "../../lib/synthetic";

const fallIssue = (t: BreathTable) => conditionTable(t).issues.find((i) => i.code === "vo2-falls-in-exercise");

/** The table with VO2 (and VCO2, as a leak takes both) scaled by `factor` between `fromS` and `toS`: an invented leak. */
function withLeak(t: BreathTable, fromS: number, toS: number, factor: number): BreathTable {
  return {
    ...t,
    rows: t.rows.map((r) =>
      r.timeS >= fromS && r.timeS <= toS ? { ...r, vo2MlMin: r.vo2MlMin! * factor, vco2MlMin: r.vco2MlMin! * factor } : r,
    ),
  };
}

describe("findVo2Fall on invented tests (truth by construction)", () => {
  const syn = generateSyntheticTest({ noise: "moderate" }, 7);
  const ex = conditionTable(syn.table).exercise!;
  const mid = (ex.startS + ex.endS) / 2;

  it("a test without a fall gives none", () => {
    expect(findVo2Fall(conditionTable(syn.noiseFree).clean, ex)).toBeNull();
    expect(fallIssue(syn.table)).toBeUndefined();
  });

  it("a 25 % leak over 90 s in mid-exercise is found there, with its size and times", () => {
    const leaky = withLeak(syn.table, mid, mid + 90, 0.75);
    const c = conditionTable(leaky);
    const fall = findVo2Fall(c.clean, c.exercise!)!;
    expect(fall).not.toBeNull();
    // the lowest 60-s window ends inside the leak (its window lies wholly in it from mid + 60 s)
    expect(fall.lowS).toBeGreaterThan(mid + 30);
    expect(fall.lowS).toBeLessThanOrEqual(mid + 95);
    // a 25 % cut against a level that kept rising: the 60-s means fall by 15-30 %
    expect(fall.fraction).toBeGreaterThan(0.15);
    expect(fall.fraction).toBeLessThan(0.3);
    const issue = fallIssue(leaky)!;
    expect(issue.severity).toBe("warning");
    expect(issue.message).toMatch(/^VO2 fell by \d+ % during exercise while the load did not fall/);
    // physiology is named beside the faults, and setting breaths aside waits for a confirmed fault
    expect(issue.message).toContain("oscillatory ventilation with long cycles, or myocardial ischaemia");
    expect(issue.message).toContain("Set those breaths aside only when a fault is confirmed");
    expect(issue.where?.timeS).toBe(fall.lowS);
  });

  it("a 5 % dip, inside breath noise, is not reported", () => {
    expect(fallIssue(withLeak(syn.table, mid, mid + 90, 0.95))).toBeUndefined();
  });

  it("is not said on 60 invented moderate-noise tests without a fall (one allowed; measured on 2 160 over six models)", () => {
    const found = syntheticBank(60, { seed: 2024, noiseLevels: ["moderate"] }).filter((c) =>
      fallIssue(generateSyntheticTest(c.spec, c.seed).table),
    );
    expect(found.length).toBeLessThanOrEqual(1);
  });
});

describe("ACTES recordings (ODC-By 1.0)", () => {
  // Chabert C, Mongin D, Hermand E, Collado A, Hue O. Cardiorespiratory measurement from graded
  // cycloergometer exercise testing (version 1.0.0). PhysioNet; 2022. https://doi.org/10.13026/2qs3-kh43.
  // Licensed under the Open Data Commons Attribution License v1.0.
  const bytes = new Uint8Array(
    readFileSync(new URL("../fixtures/open-data/actes/actes_vo2_breaths_derived.csv", import.meta.url)),
  );

  it("test 4: VO2 falls from about 1.7 to 1.35 L/min at 185-215 W (700-800 s), as a clinical review read by hand", async () => {
    const r = await importBreathFile(bytes, { select: { ID: "4" } });
    const c = conditionTable(r.table!);
    const fall = findVo2Fall(c.clean, c.exercise!)!;
    expect(fall.fraction).toBeGreaterThan(0.15);
    expect(fall.lowS).toBeGreaterThan(740);
    expect(fall.lowS).toBeLessThan(820);
    expect(fall.lowMlMin).toBeGreaterThan(1200);
    expect(fall.lowMlMin).toBeLessThan(1450);
  });

  it("is said for a minority of the 18 tests, each with a fall of at least the cut-off", async () => {
    const flagged: string[] = [];
    for (let id = 1; id <= 18; id++) {
      const r = await importBreathFile(bytes, { select: { ID: String(id) } });
      const c = conditionTable(r.table!);
      const fall = findVo2Fall(c.clean, c.exercise!);
      if (fall) {
        expect(fall.fraction).toBeGreaterThanOrEqual(VO2_FALL_MIN_FRACTION);
        flagged.push(String(id));
      }
    }
    // tests 4, 7 and 14 when this was written: each a visible fall at a held or rising load
    expect(flagged).toContain("4");
    expect(flagged.length).toBeLessThanOrEqual(3);
  });
});
