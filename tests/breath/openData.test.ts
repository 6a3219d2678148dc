import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { analyse, buildRecord } from "../../lib/analysis";
import { importBreathFile } from "../../lib/breath";
import { conditionTable } from "../../lib/signal";

const read = (path: string) => new Uint8Array(readFileSync(new URL(`../fixtures/open-data/${path}`, import.meta.url)));
const csvRows = (path: string) =>
  new TextDecoder()
    .decode(read(path))
    .trim()
    .split("\n")
    .slice(1)
    .map((l) => l.split(","));

describe("ACTES breath VO2 (ODC-By 1.0)", () => {
  // Chabert C, Mongin D, Hermand E, Collado A, Hue O. Cardiorespiratory measurement from graded
  // cycloergometer exercise testing (version 1.0.0). PhysioNet; 2022. https://doi.org/10.13026/2qs3-kh43.
  // Licensed under the Open Data Commons Attribution License v1.0.
  const summary = csvRows("actes/actes_tests_summary.csv");

  it("actes_vo2_breaths_derived.csv: VO2 in L/min converted, negative rest times kept, phases and 15 W/min steps found", async () => {
    for (const id of ["1", "3", "11"]) {
      const r = await importBreathFile(read("actes/actes_vo2_breaths_derived.csv"), { select: { ID: id } });
      expect(r.table).not.toBeNull();
      const s = summary.find((x) => x[0] === id)!;
      // summary columns: rest_s_before_t0 = s[8], exercise_s = s[9], step_W = s[12], VO2_max_breath_L_min = s[14]
      expect(r.table!.rows[0].timeS).toBeCloseTo(-Number(s[8]), 0);
      const maxVo2 = Math.max(...r.table!.rows.map((x) => x.vo2MlMin ?? 0));
      expect(maxVo2).toBeCloseTo(Number(s[14]) * 1000, -1); // L/min × 1000 = mL/min
      expect(r.columns.find((c) => c.header === "VO2_L_min")?.factor).toBe(1000);
      const c = conditionTable(r.table!);
      // protocol: 50 W warm-up from t = 0, then +15 W every minute (README) → ramp rate 15 ± 1 W/min
      expect(c.rampRateWPerMin!).toBeGreaterThan(Number(s[12]) - 1);
      expect(c.rampRateWPerMin!).toBeLessThan(Number(s[12]) + 1);
      expect(c.phases.map((p) => p.phase)).toEqual(["rest", "warmup", "exercise", "recovery"]);
      // exercise (loaded) ends at exercise_s after t = 0, within one breath (~3 s)
      expect(Math.abs(c.exercise!.endS - Number(s[9]))).toBeLessThan(3);
    }
  });

  it("a file with all 18 tests is refused until one test is selected", async () => {
    const r = await importBreathFile(read("actes/actes_vo2_breaths_derived.csv"));
    expect(r.table).toBeNull();
    expect(r.issues.find((i) => i.code === "several-records")?.message).toMatch(/18 tests/);
    // before a test is chosen the column review already says the R–R column will give heart rate
    const beats = await importBreathFile(read("actes/actes_test_measure.csv"));
    expect(beats.table).toBeNull();
    expect(beats.columns.find((c) => c.header === "RR")).toMatchObject({ field: "hrBpm", unit: "R–R interval, ms" });
  });

  it("actes_subject-info.csv (ages, weights and threshold powers keyed by ID, no VO2): refused for having no VO2 first, then for holding 18 people", async () => {
    const r = await importBreathFile(read("actes/actes_subject-info.csv"));
    expect(r.table).toBeNull();
    const errors = r.issues.filter((i) => i.severity === "error").map((i) => i.code);
    expect(errors).toEqual(["no-vo2-column", "several-records"]);
  });

  it("actes_test_measure.csv: RR is the R–R interval (ms), not breathing; VO2 carried on every beat collapses to the breath series", async () => {
    const r = await importBreathFile(read("actes/actes_test_measure.csv"), { select: { ID: "1" } });
    const rr = r.columns.find((c) => c.header === "RR")!;
    // the heart periods become heart rate (60 000 / R–R), never respiratory rate
    expect(rr.field).toBe("hrBpm");
    expect(rr.unit).toMatch(/ms/);
    expect(r.issues.map((i) => i.code)).toEqual(
      expect.arrayContaining(["rr-interval-not-breathing", "values-carried-forward", "hr-from-rr-intervals"]),
    );
    expect(r.table!.fields).not.toContain("rrBrMin");
    expect(r.table!.fields).toContain("hrBpm");
    // the derived breath file was made the same way (one row per change of VO2): same row count and times
    const derived = await importBreathFile(read("actes/actes_vo2_breaths_derived.csv"), { select: { ID: "1" } });
    expect(r.table!.rows.length).toBe(derived.table!.rows.length);
    expect(r.table!.rows.map((x) => x.timeS)).toEqual(derived.table!.rows.map((x) => x.timeS));
  });
});

describe("ACTES heart rate from R–R intervals (ODC-By 1.0)", () => {
  // Chabert C, Mongin D, Hermand E, Collado A, Hue O. Cardiorespiratory measurement from graded
  // cycloergometer exercise testing (version 1.0.0). PhysioNet; 2022. https://doi.org/10.13026/2qs3-kh43.
  // Licensed under the Open Data Commons Attribution License v1.0.
  // The check values are computed here from the raw beats, independently of the importer: heart rate over a window is
  // 60 000 × beats / Σ R–R (ms), over the beats of the loaded exercise (power > 0).
  const beats = csvRows("actes/actes_test_measure.csv").map((x) => ({
    id: x[0],
    t: Number(x[1]),
    rr: x[2] === "" ? NaN : Number(x[2]),
    power: Number(x[4]),
  }));
  const rateOver = (bs: typeof beats) => {
    const kept = bs.filter((b) => Number.isFinite(b.rr));
    return kept.length === 0 ? NaN : (60000 * kept.length) / kept.reduce((s, b) => s + b.rr, 0);
  };
  const fromBeats = (id: string) => {
    const all = beats.filter((b) => b.id === id);
    const loaded = all.filter((b) => b.power > 0);
    const endS = loaded[loaded.length - 1].t;
    let peak = 0;
    for (const b of loaded) {
      const w = all.filter((y) => y.t > b.t - 30 && y.t <= b.t && y.t >= 0);
      if (w.filter((y) => Number.isFinite(y.rr)).length >= 20) peak = Math.max(peak, rateOver(w));
    }
    return { peak, endS, at60: rateOver(all.filter((y) => y.t >= endS + 55 && y.t <= endS + 65)) };
  };
  const analysed = async (id: string) => {
    const built = await buildRecord({
      bytes: read("actes/actes_test_measure.csv"),
      fileName: "actes_test_measure.csv",
      patient: {},
      ergometer: "cycle",
      importOptions: { select: { ID: id } },
    });
    return analyse(built.record!, {});
  };

  it("peak HR (highest 30-s window) of 17 tests matches the beats within 0.3 bpm; HR recovery at 1 min within 2.5 bpm", async () => {
    const ids = Array.from({ length: 18 }, (_, i) => String(i + 1)).filter((id) => id !== "17");
    for (const id of ids) {
      const ref = fromBeats(id);
      const a = await analysed(id);
      // breath-level means versus beat windows: the same beats, grouped by breath, so only the window edges differ
      expect(Math.abs(a.indices.peaks.hrBpm.value! - ref.peak)).toBeLessThan(0.3);
      // the engine interpolates HR exactly 60 s after the end; the check value is the 55–65 s mean: slower than 1 bpm/s
      expect(Math.abs(a.indices.heartRate.recovery1MinBpm.value! - (ref.peak - ref.at60))).toBeLessThan(2.5);
    }
  });

  it("test 17 has no R–R values from 543 s to past the end of exercise (677 s): no peak HR is claimed, and the gap is named", async () => {
    const r = await importBreathFile(read("actes/actes_test_measure.csv"), { select: { ID: "17" } });
    const note = r.issues.find((i) => i.code === "hr-from-rr-intervals")!;
    expect(note.severity).toBe("warning");
    expect(note.message).toMatch(/breaths have no heart rate/);
    expect(note.message).toMatch(/54\d–(69|70)\d s/);
    const a = await analysed("17");
    expect(a.indices.peaks.hrBpm.value).toBeNull();
    expect(a.indices.peaks.hrBpm.reason).toMatch(/gap/);
  });

  it("test 11: its highest VO2 window ends about 2 min before the end of exercise, so no VO2 plateau is read as the limit reached", async () => {
    // age, weight and height of test 11 from actes_subject-info.csv (18 y, 84.8 kg, 182 cm); ACTES records no sex
    const built = await buildRecord({
      bytes: read("actes/actes_test_measure.csv"),
      fileName: "actes_test_measure.csv",
      patient: { ageY: 18, weightKg: 84.8, heightCm: 182 },
      ergometer: "cycle",
      importOptions: { select: { ID: "11" } },
    });
    const a = analyse(built.record!, {});
    expect(a.issues.map((i) => i.code)).toContain("peak-vo2-before-end");
    // the review's own check: the 30-s peak ends at 1144 s and exercise at 1267 s
    expect(a.interpretInput.values.vo2Plateau).toBeNull();
    expect(a.interpretInput.reasons?.vo2Plateau).toMatch(/check those breaths before reading a plateau/);
    expect(a.interpretation.effort.label).not.toMatch(/plateau/i);
  });
});

describe("Sylta 2016 cycling stages (CC0)", () => {
  // Data from Sylta et al., Med Sci Sports Exerc 2016;48:2165–2174, as curated in the exscidata R package
  // by D. Hammarström (CC0).
  it("cyclingstudy_stages_long.csv: stage table of one occasion, units from the column names", async () => {
    const r = await importBreathFile(read("sylta2016-cycling/cyclingstudy_stages_long.csv"), {
      select: { subject: "1", timepoint: "pre" },
      stageDurationS: 300,
    });
    expect(r.table?.shape).toBe("stage");
    // subject 1, pre: loads 125, 175, 225, 250, 275 W with VO2 2309 … 4290 mL/min (first rows of the file)
    expect(r.table!.rows.map((x) => x.workW)).toEqual([125, 175, 225, 250, 275]);
    expect(r.table!.rows[0].vo2MlMin).toBe(2309);
    expect(r.table!.rows[0].vco2MlMin).toBe(2113);
    expect(r.table!.rows[0].lactateMmolL).toBe(1.5);
    expect(r.table!.rows[4].timeS).toBe(4 * 300);
    expect(r.issues.map((i) => i.code)).toContain("time-assumed-stage-order");
    expect(r.weight).toEqual({ kg: 80.3, from: "column" });
  });

  it("without choosing the occasion the file is refused with the column to choose by", async () => {
    const r = await importBreathFile(read("sylta2016-cycling/cyclingstudy_stages_long.csv"), { select: { subject: "1" } });
    expect(r.table).toBeNull();
    expect(r.issues.find((i) => i.code === "several-records")?.where?.column).toBe("timepoint");
  });
});

describe("TCD graded tests (CC BY 4.0)", () => {
  // Donne B, Fleming N, Campbell G, Ward T, Crampton D, Mahony N. Graded Incremental Test Data (Cycling,
  // Running, Kayaking, Rowing): an open access dataset. Version 2. Zenodo; 2024.
  // https://doi.org/10.5281/zenodo.10841412. CC BY 4.0. Changes: stage tables extracted to CSV and filtered
  // (extraction by B. Cai, github.com/xcai66/Calibration-of-Heart-Rate-Reserve-for-Graded-Cycle-Ergometry);
  // summary table added.
  const tidy = csvRows("tcd-graded-tests/graded_tests_tidy.csv");

  it("graded_tests_tidy.csv, a cycling test: VO2 per kg recognised; converted when the weight is given", async () => {
    const file = tidy.find((x) => x[1] === "Cycling")![0];
    const rows = tidy.filter((x) => x[0] === file);
    const r = await importBreathFile(read("tcd-graded-tests/graded_tests_tidy.csv"), { select: { file }, weightKg: 70 });
    expect(r.table?.shape).toBe("stage");
    expect(r.columns.find((c) => c.header === "vo2")?.unit).toBe("mL/kg/min");
    // columns: load = x[8], vo2 = x[10]; VO2 mL/min = vo2 (mL/kg/min) × 70 kg
    expect(r.table!.rows.map((x) => x.workW)).toEqual(rows.map((x) => Number(x[8])));
    expect(r.table!.rows[0].vo2MlMin).toBeCloseTo(Number(rows[0][10]) * 70, 6);
  });

  it("a running test: the load column holds speed in km/h, not watts", async () => {
    const file = tidy.find((x) => x[1] === "Running")![0];
    const r = await importBreathFile(read("tcd-graded-tests/graded_tests_tidy.csv"), { select: { file } });
    expect(r.columns.find((c) => c.header === "load")?.field).toBe("speedKmh");
    expect(r.issues.map((i) => i.code)).toEqual(expect.arrayContaining(["speed-in-load-column", "weight-needed"]));
    // the user can overrule: treat "load" as watts
    const forced = await importBreathFile(read("tcd-graded-tests/graded_tests_tidy.csv"), {
      select: { file },
      mapping: { load: { field: "workW", unit: "W" } },
    });
    expect(forced.columns.find((c) => c.header === "load")?.field).toBe("workW");
  });
});
