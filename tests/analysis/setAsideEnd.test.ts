/**
 * A span set aside by review at the end of exercise: the test keeps its phases, heart rate and load, and the highest VO2
 * before the span is shown but not read (a leak over the last minutes is where peak values are read). Also: a VO2 fall at
 * the end of exercise is not read as a plateau. Inputs: the INVENTED demo case "normal-adult" (tests/fixtures/cases) and
 * ACTES test 14 (Chabert C, Mongin D, Hermand E, Collado A, Hue O. Cardiorespiratory measurement from graded
 * cycloergometer exercise testing, v1.0.0, PhysioNet 2022, doi:10.13026/2qs3-kh43; ODC-By 1.0).
 */
import fs from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { analyse, buildRecord } from "../../lib/analysis";
import { analysisCharts } from "../../lib/report/analysisCharts";
import { caseRecord } from "../fixtures/caseRecord";

describe("the last two minutes of exercise set aside by review (INVENTED demo)", () => {
  it("keeps the exercise phase, peak HR and work rate; peak VO2 is shown, not read, with a warning", async () => {
    const record = await caseRecord("normal-adult");
    const plain = analyse(record);
    const ex = plain.conditioned.exercise!;
    const span = { startS: ex.endS - 120, endS: ex.endS + 1, reason: "mask leak over the last two minutes (INVENTED)" };
    const r = analyse(record, { conditioning: { setAside: [span] } });
    // the phases come from the load and markers, which a leak does not touch
    expect(r.conditioned.exercise).toEqual(plain.conditioned.exercise);
    expect(r.indices.peaks.hrBpm.value).toBe(plain.indices.peaks.hrBpm.value);
    expect(r.indices.peaks.workW.value).toBe(plain.indices.peaks.workW.value);
    // the highest VO2 before the span, lower than the true peak, with the gap named
    expect(r.indices.peaks.vo2MlMin.value!).toBeLessThan(plain.indices.peaks.vo2MlMin.value!);
    expect(r.indices.peaks.vo2EndMissingS).toBeGreaterThan(110);
    const warning = r.issues.find((i) => i.code === "peak-vo2-end-missing")!;
    expect(warning.message).toMatch(
      /^The last 1\d\d s of exercise \(to \d+:\d\d\) hold no full 30-s window of VO2 \(set aside by review, or missing/,
    );
    expect(r.issues.map((i) => i.code)).not.toContain("peak-vo2-before-end");
    // shown, not read: no % predicted grading, no plateau, no O2 pulse reading
    expect(r.interpretInput.notRead?.peakVo2PctPred).toMatch(/^the last \d+ s of exercise hold no full window of gas values/);
    // nor are peak RER and ventilation: effort is not called submaximal on an RER read before the span
    expect(r.interpretInput.notRead?.peakRer).toBeDefined();
    expect(r.interpretInput.notRead?.veMvvPct).toBeDefined();
    expect(r.interpretation.effort.verdict).not.toBe("submaximal");
    expect(r.interpretInput.notRead?.o2PulsePctPred).toBeDefined();
    expect(r.interpretation.path.steps.find((s) => s.nodeId === "peak-vo2")!.outcome).toBe("not-assessable");
  });

  it("a 30-s peak window never rests on the one or two breaths left beside a span", async () => {
    const record = await caseRecord("normal-adult");
    const ex = analyse(record).conditioned.exercise!;
    // a span that leaves one breath near the end of exercise, as a reviewer's span can
    const rows = record.table.rows.filter((x) => x.timeS > ex.endS - 100 && x.timeS <= ex.endS);
    const lone = rows[Math.floor(rows.length / 2)].timeS;
    const r = analyse(record, {
      conditioning: {
        setAside: [
          { startS: ex.endS - 100, endS: lone - 0.01, reason: "leak (INVENTED)" },
          { startS: lone + 0.01, endS: ex.endS + 1, reason: "leak (INVENTED)" },
        ],
      },
    });
    const win = r.indices.peaks.vo2MlMin.provenance.window!;
    expect(win.endS).toBeLessThan(ex.endS - 100);
  });
});

describe("heart rate set aside by review (an INVENTED ECG artefact)", () => {
  it("a 40-s run of doubled beats sets peak HR; setting the heart rate aside there restores it and keeps the gases", async () => {
    const record = await caseRecord("normal-adult");
    const plain = analyse(record);
    const ex = plain.conditioned.exercise!;
    const [from, to] = [ex.endS - 100, ex.endS - 60];
    // double counting of the ECG: the heart rate reads twice its value for 40 s (INVENTED)
    const rows = record.table.rows.map((r) =>
      r.timeS >= from && r.timeS <= to && r.hrBpm !== undefined ? { ...r, hrBpm: r.hrBpm * 2 } : r,
    );
    const faulty = { ...record, table: { ...record.table, rows } };
    expect(analyse(faulty).indices.peaks.hrBpm.value!).toBeGreaterThan(plain.indices.peaks.hrBpm.value! + 50);
    const r = analyse(faulty, {
      conditioning: { setAside: [{ startS: from, endS: to, reason: "ECG double counting (INVENTED)", channel: "heart-rate" }] },
    });
    expect(r.indices.peaks.hrBpm.value).toBeCloseTo(plain.indices.peaks.hrBpm.value!, 6);
    // the gases are untouched
    expect(r.indices.peaks.vo2MlMin.value).toBe(plain.indices.peaks.vo2MlMin.value);
    // the time-course chart marks the span by its channel
    const bands = analysisCharts(r).find((c) => c.id === "time-course")!.bands!;
    expect(bands.filter((b) => b.kind === "set-aside").map((b) => b.label)).toEqual(["HR set aside"]);
    expect(r.issues.find((i) => i.code === "breaths-set-aside-by-review")?.message).toMatch(
      /^The heart rate of \d+ row\(s\) from .* were set aside by review: ECG double counting \(INVENTED\)\. The gas values and the load there are kept\.$/,
    );
  });
});

describe("a fall of VO2 at the end of exercise is not a plateau (ACTES 14, ODC-By 1.0)", () => {
  it("the plateau criterion is not determined, with the fall as the reason", async () => {
    const file = path.resolve(__dirname, "../fixtures/open-data/actes/actes_vo2_breaths_derived.csv");
    const built = await buildRecord({
      bytes: new Uint8Array(fs.readFileSync(file)),
      fileName: "actes_vo2_breaths_derived.csv",
      patient: { sex: "male", ageY: 30, heightCm: 175, weightKg: 70 },
      ergometer: "cycle",
      referral: "general",
      importOptions: { select: { ID: "14" } },
    });
    const r = analyse(built.record!);
    expect(r.conditioned.vo2Fall).toBeTruthy();
    expect(r.issues.map((i) => i.code)).toContain("vo2-falls-in-exercise");
    expect(r.indices.vo2FinalIncrease.increaseMlKgMin.value).toBeNull();
    expect(r.indices.vo2FinalIncrease.increaseMlKgMin.reason).toMatch(/^VO2 fell by 15 % at a held or rising load/);
    expect(r.interpretation.effort.label).not.toMatch(/VO2 plateau/);
  });

  it("a few breaths left at the very end do not hide the gap (the last covered window counts, not the last breath)", async () => {
    const record = await caseRecord("normal-adult");
    const ex = analyse(record).conditioned.exercise!;
    const r = analyse(record, {
      conditioning: { setAside: [{ startS: ex.endS - 120, endS: ex.endS - 6, reason: "leak, last breaths kept (INVENTED)" }] },
    });
    expect(r.indices.peaks.vo2EndMissingS).toBeGreaterThan(80);
    expect(r.interpretInput.notRead?.peakVo2PctPred).toBeDefined();
  });
});
