/**
 * Predicted values against measured peak values in open datasets.
 *
 * Data attributions (carried as the dataset READMEs require):
 * - Data from Sylta et al., Med Sci Sports Exerc 2016;48:2165–2174, as curated in the exscidata R
 *   package by D. Hammarström (CC0).
 * - Donne B, Fleming N, Campbell G, Ward T, Crampton D, Mahony N. Graded Incremental Test Data
 *   (Cycling, Running, Kayaking, Rowing): an open access dataset. Version 2. Zenodo; 2024.
 *   https://doi.org/10.5281/zenodo.10841412. CC BY 4.0. Changes: stage tables extracted to CSV and
 *   filtered (extraction by B. Cai, github.com/xcai66/Calibration-of-Heart-Rate-Reserve-for-Graded-Cycle-Ergometry);
 *   summary table added.
 * - Chabert C, Mongin D, Hermand E, Collado A, Hue O. Cardiorespiratory measurement from graded
 *   cycloergometer exercise testing (version 1.0.0). PhysioNet; 2022. https://doi.org/10.13026/2qs3-kh43.
 *   Licensed under the Open Data Commons Attribution License v1.0. PhysioNet resource: Goldberger AL,
 *   Amaral LAN, Glass L, et al. PhysioBank, PhysioToolkit, and PhysioNet. Circulation 2000;101(23):e215–e220.
 */
import fs from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { evaluateEquation, percentPredicted, toQuantity, type PredictedValue } from "../../lib/predicted";
import type { Ergometer, Sex } from "../../lib/core";

const OPEN = path.resolve(__dirname, "../fixtures/open-data");

/** Minimal CSV reader for these files (no quoted commas in the columns used). */
function readCsv(rel: string): Record<string, string>[] {
  const [head, ...rows] = fs.readFileSync(path.join(OPEN, rel), "utf8").trim().split(/\r?\n/);
  const keys = head.split(",").map((k) => k.replace(/"/g, ""));
  return rows.map((r) => {
    const cells = r.split(",");
    return Object.fromEntries(keys.map((k, i) => [k, (cells[i] ?? "").replace(/"/g, "").trim()]));
  });
}

function quantile(values: number[], p: number): number {
  const s = [...values].sort((a, b) => a - b);
  const pos = p * (s.length - 1);
  const lo = Math.floor(pos);
  return s[lo] + (s[Math.min(lo + 1, s.length - 1)] - s[lo]) * (pos - lo);
}
const median = (v: number[]) => quantile(v, 0.5);

function predictMlMin(
  id: string,
  sex: Sex,
  ageY: number,
  heightCm: number | undefined,
  weightKg: number,
  ergometer: Ergometer,
): PredictedValue {
  return toQuantity(evaluateEquation(id, { patient: { sex, ageY, heightCm, weightKg }, ergometer }), "vo2PeakMlMin", weightKg);
}

describe("Sylta 2016 trained cyclists (cycle, VO2max in mL/min, first test of each of 20 cyclists)", () => {
  // No sex column. Assumption: male (heights 168–193 cm, VO2max 3447–6380 mL/min fit the study's male
  // cyclists; the study's sex is recalled, not in the data). Every fact below is also checked as if
  // female, which lowers the prediction, so the assumption cannot flip it.
  const rows = readCsv("sylta2016-cycling/cyclingstudy.csv").filter((r) => r.timepoint === "pre" && r["VO2.max"] !== "");
  const people = rows.map((r) => ({
    ageY: Number(r.age),
    heightCm: Number(r["height.T1"]),
    weightKg: Number(r["weight.T1"]),
    vo2: Number(r["VO2.max"]),
  }));
  const pct = (id: string, sex: Sex) =>
    people.map((p) => percentPredicted(p.vo2, predictMlMin(id, sex, p.ageY, p.heightCm, p.weightKg, "cycle").value) as number);

  it("uses 20 cyclists with a measured VO2max", () => {
    expect(people.length).toBe(20);
    for (const p of people) expect(p.vo2).toBeGreaterThan(3000);
  });

  it("Hansen cycle: median % predicted > 100 (found ≈165 %), every cyclist > 120 % (found min ≈143 %)", () => {
    for (const sex of ["male", "female"] as const) {
      const v = pct("hansen-1984", sex);
      expect(median(v)).toBeGreaterThan(100);
      expect(Math.min(...v)).toBeGreaterThan(120);
    }
  });

  it("Jones 1985: every cyclist is more than 2 SEE above prediction (found z min ≈2.3, median ≈3.4)", () => {
    const z = people.map(
      (p) =>
        evaluateEquation("jones-1985", { patient: { sex: "male", ...p }, ergometer: "cycle" }, { measured: p.vo2 })
          .zScore as number,
    );
    expect(Math.min(...z)).toBeGreaterThan(2);
  });

  it("FRIEND 2018 (cycle mode) predicts higher than Hansen cycle, so % predicted reads lower (clinical-reference §7 item 4)", () => {
    // found: median 165 % (Hansen) vs 144 % (FRIEND 2018)
    expect(median(pct("hansen-1984", "male")) - median(pct("friend-2018", "male"))).toBeGreaterThan(10);
    expect(median(pct("friend-2018", "male"))).toBeGreaterThan(100);
  });
});

describe("TCD graded tests (sex, age, VO2max in mL/kg/min, HRmax; no height or weight)", () => {
  const tests = readCsv("tcd-graded-tests/tcd_tests_summary.csv").map((r) => ({
    sport: r.sport,
    sex: (r.gender === "M" ? "male" : r.gender === "F" ? "female" : undefined) as Sex | undefined,
    ageY: r.age_years === "" ? Number.NaN : Number(r.age_years),
    vo2: Number(r.vo2max),
    hrMax: Number(r.hrmax),
  }));
  const groups = [
    { sport: "Running", ergometer: "treadmill" as const },
    { sport: "Cycling", ergometer: "cycle" as const },
  ];

  it("FRIEND 2017 with a deliberately low weight (men 55 kg, women 45 kg — which raises the prediction) still gives median > 110 % predicted", () => {
    // Weight is not in the extract. FRIEND 2017 falls by 0.127·2.20462 = 0.28 mL/kg/min per kg, so a low
    // assumed weight gives a high prediction and a conservative % predicted. Ages outside 20–79 and the
    // documented transcription error (vo2max 457) are left out. Found medians: 122–135 %.
    for (const { sport, ergometer } of groups) {
      for (const sex of ["male", "female"] as const) {
        const g = tests.filter((t) => t.sport === sport && t.sex === sex && t.ageY >= 20 && t.ageY <= 79 && t.vo2 < 100);
        expect(g.length).toBeGreaterThan(40);
        const v = g.map((t) => {
          const p = evaluateEquation("friend-2017", {
            patient: { sex, ageY: t.ageY, weightKg: sex === "male" ? 55 : 45 },
            ergometer,
          });
          return percentPredicted(t.vo2, p.value) as number;
        });
        expect(median(v), `${sport} ${sex}`).toBeGreaterThan(110);
      }
    }
  });

  it("HRmax: 220 − age and Tanaka are unbiased within 6 beats/min; Jones 1985 under-predicts in every group", () => {
    // Found medians of measured − predicted: 220 − age −5.9…0.0; Tanaka −2.3…+3.0; Jones +4.2…+9.6.
    // HRmax values 250 and 383 (documented transcription errors) and tests without age are left out.
    for (const { sport, ergometer } of groups) {
      for (const sex of ["male", "female"] as const) {
        const g = tests.filter(
          (t) => t.sport === sport && t.sex === sex && Number.isFinite(t.ageY) && t.hrMax > 120 && t.hrMax < 230,
        );
        const diff = (id: string) =>
          g.map((t) => t.hrMax - (evaluateEquation(id, { patient: { sex, ageY: t.ageY }, ergometer }).value as number));
        expect(Math.abs(median(diff("hrmax-220-age"))), `${sport} ${sex} 220-age`).toBeLessThanOrEqual(6);
        expect(Math.abs(median(diff("tanaka-2001"))), `${sport} ${sex} Tanaka`).toBeLessThanOrEqual(6);
        expect(median(diff("jones-1985-hrmax")), `${sport} ${sex} Jones`).toBeGreaterThan(0);
        // Spread about ±1 SEE (Jones SEE 10.3): most tests within 10 beats/min of Tanaka (found 69–86 %).
        const within = diff("tanaka-2001").filter((d) => Math.abs(d) <= 10).length / g.length;
        expect(within, `${sport} ${sex}`).toBeGreaterThan(0.6);
      }
    }
  });
});

describe("ACTES young athletes, 12–18 y (cycle; breath VO2 in L/min; age, height, weight; no sex)", () => {
  const subjects = readCsv("actes/actes_subject-info.csv").map((r) => ({
    id: r.ID,
    ageY: Number(r.age),
    heightCm: Number(r.Height),
    weightKg: Number(r.Weight),
  }));
  const breaths = readCsv("actes/actes_vo2_breaths_derived.csv").map((r) => ({
    id: r.ID,
    t: Number(r.time_s),
    vo2: Number(r.VO2_L_min) * 1000,
    w: Number(r.power_W),
  }));

  /** Peak VO2 = highest 30-s time-weighted average while loaded (each breath holds until the next; common practice). */
  function peak30(id: string): number {
    const b = breaths.filter((x) => x.id === id && x.w > 0);
    let best = 0;
    for (let i = 0; i < b.length; i++) {
      const end = b[i].t + 30;
      if (b[b.length - 1].t < end) break;
      let area = 0;
      for (let k = i; k < b.length - 1 && b[k].t < end; k++) area += b[k].vo2 * (Math.min(b[k + 1].t, end) - b[k].t);
      best = Math.max(best, area / 30);
    }
    return best;
  }
  const people = subjects.map((s) => ({ ...s, peak: peak30(s.id) }));

  it("peak VO2 from breaths is plausible (1.2–4.6 L/min per the README)", () => {
    for (const p of people) {
      expect(p.peak).toBeGreaterThan(1000);
      expect(p.peak).toBeLessThan(4700);
    }
  });

  it("adult equations raise out-of-population warnings: Jones under 15 y, Hansen (adult cohort) under 18 y", () => {
    for (const p of people) {
      const jones = evaluateEquation("jones-1985", { patient: { sex: "male", ...p }, ergometer: "cycle" });
      const ageFlag = jones.issues.some((i) => i.code === "outside-derivation-population" && i.where?.field === "ageY");
      expect(ageFlag, `subject ${p.id} age ${p.ageY}`).toBe(p.ageY < 15);
      const hansen = evaluateEquation("hansen-1984", { patient: { sex: "male", ...p }, ergometer: "cycle" });
      expect(hansen.issues.some((i) => i.where?.field === "ageY")).toBe(p.ageY < 18);
    }
  });

  it("without sex the reading is undetermined: assuming female instead of male raises Hansen % predicted by ≥ 15 points for everyone", () => {
    // Found: male assumption median ≈81 % (47–99 %), female assumption median ≈113 % (63–152 %).
    const male = people.map(
      (p) =>
        percentPredicted(p.peak, predictMlMin("hansen-1984", "male", p.ageY, p.heightCm, p.weightKg, "cycle").value) as number,
    );
    const female = people.map(
      (p) =>
        percentPredicted(p.peak, predictMlMin("hansen-1984", "female", p.ageY, p.heightCm, p.weightKg, "cycle").value) as number,
    );
    male.forEach((m, i) => expect(female[i] - m).toBeGreaterThanOrEqual(15));
    expect(median(male)).toBeLessThan(100);
    expect(median(female)).toBeGreaterThan(100);
  });
});
