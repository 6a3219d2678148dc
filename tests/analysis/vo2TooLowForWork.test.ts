/**
 * VO2 that rises too little with work (ΔVO2/ΔWR, Hansen 1987: circulatory disorders 8.29 ± 1.17, confirmed): below 6.0
 * (− 2 SD, `SUSPECT_DVO2_DWR_ML_MIN_W`) a warning asks for a check and the value is still read; below 4.8 (− 3 SD,
 * `IMPLAUSIBLE_DVO2_DWR_ML_MIN_W`) VO2-based values are shown and not interpreted, so a leak cannot read as heart disease.
 * Checked by construction on an INVENTED demo case (tests/fixtures/cases) whose gas signals are halved, as a leaking
 * mask would, and on real tests of the ACTES set (Chabert C, Mongin D, Hermand E, Collado A, Hue O. Cardiorespiratory
 * measurement from graded cycloergometer exercise testing, v1.0.0, PhysioNet 2022, doi:10.13026/2qs3-kh43; ODC-By 1.0).
 */
import fs from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { analyse, buildRecord, type TestRecord } from "../../lib/analysis";
import { IMPLAUSIBLE_DVO2_DWR_ML_MIN_W, SUSPECT_DVO2_DWR_ML_MIN_W } from "../../lib/thresholds/dVo2dWr";
import { caseRecord } from "../fixtures/caseRecord";

/** Every gas volume scaled by `f` (VO2, VCO2, VE): a leak that loses part of each breath (INVENTED). */
function leaking(record: TestRecord, f: number): TestRecord {
  const rows = record.table.rows.map((r) => ({
    ...r,
    ...(r.vo2MlMin !== undefined ? { vo2MlMin: r.vo2MlMin * f } : {}),
    ...(r.vco2MlMin !== undefined ? { vco2MlMin: r.vco2MlMin * f } : {}),
    ...(r.veLMin !== undefined ? { veLMin: r.veLMin * f } : {}),
  }));
  return { ...record, table: { ...record.table, rows } };
}

const cardiovascular = (r: ReturnType<typeof analyse>) =>
  r.interpretation.patterns.find((p) => p.patternId === "cardiovascular")!;

describe("VO2 read at a reviewer's word (AnalysisSettings.vo2Checked)", () => {
  it("the same 60 % leak, with the cart checked by a reviewer: VO2-based values are read, and the warning says on whose word", async () => {
    const base = { ...(await caseRecord("normal-adult")), referral: "heart-failure" as const };
    const doubted = analyse(leaking(base, 0.4));
    const checked = analyse(leaking(base, 0.4), {
      vo2Checked: { reason: "calibration and a biological control checked, by Dr Invented" },
    });
    // not read without the reviewer's word; read with it
    expect(doubted.interpretation.path.steps.find((s) => s.nodeId === "peak-vo2")!.outcome).toBe("not-assessable");
    expect(checked.interpretation.path.steps.find((s) => s.nodeId === "peak-vo2")!.outcome).not.toBe("not-assessable");
    expect(checked.interpretInput.notRead?.peakVo2PctPred).toBeUndefined();
    // the measured values are the same either way
    expect(checked.indices.peaks.vo2MlMin.value).toBe(doubted.indices.peaks.vo2MlMin.value);
    const codes = checked.issues.map((i) => i.code);
    expect(codes).not.toContain("vo2-too-low-for-work");
    const said = checked.issues.find((i) => i.code === "vo2-read-at-review")!;
    expect(said.severity).toBe("warning");
    expect(said.message).toMatch(/^VO2 rose only \d+\.\d mL\/min per W of work rate/);
    expect(said.message).toContain(
      "read all the same, at a reviewer's word: calibration and a biological control checked, by Dr Invented.",
    );
    expect(said.message).not.toContain("not interpreted");
    // the conclusion says it under the findings; ΔVO2/ΔWR, the value that raised the doubt, is still not read
    const slope = checked.indices.dVo2dWr.whole.slope.value!.toFixed(1);
    expect(checked.draft.sections.find((x) => x.id === "conclusion")!.paragraphs).toContain(
      `VO2-based values were read at a reviewer's word, although ΔVO2/ΔWR was ${slope} mL/min/W, below 4.8: calibration and a biological control checked, by Dr Invented. Read them with that doubt.`,
    );
    expect(checked.interpretInput.notRead?.dVo2dWr).toMatch(/^it is the value that made VO2 doubtful/);
    for (const p of checked.interpretation.patterns)
      for (const f of [...p.for, ...p.against]) expect(f.text).not.toMatch(/^ΔVO2\/ΔWR/);
  });

  it("on a test whose VO2 is believable the setting changes nothing", async () => {
    const base = await caseRecord("normal-adult");
    const plain = analyse(base);
    const checked = analyse(base, { vo2Checked: { reason: "routine check" } });
    expect(checked.issues.map((i) => i.code)).toEqual(plain.issues.map((i) => i.code));
    expect(checked.interpretation.path.steps.map((s) => s.outcome)).toEqual(
      plain.interpretation.path.steps.map((s) => s.outcome),
    );
  });
});

describe("VO2 too low for the work done", () => {
  it("a leak that loses 60 % of every gas signal is flagged, and nothing VO2-based is interpreted", async () => {
    const base = await caseRecord("normal-adult");
    const good = analyse(base);
    const slope = good.indices.dVo2dWr.whole.slope.value!;
    expect(slope).toBeGreaterThan(8.5); // a normal adult (Hansen 1987: 10.3 ± 1.0, confirmed)
    expect(good.issues.map((i) => i.code)).not.toContain("vo2-too-low-for-work");
    // referred for heart failure, so the Weber class and the peak VO2 grade are applied
    const r = analyse(leaking({ ...base, referral: "heart-failure" }, 0.4));
    const low = r.indices.dVo2dWr.whole.slope.value!;
    // OLS of (0.4 · VO2) on work = 0.4 × the slope, by construction
    expect(low).toBeCloseTo(slope * 0.4, 6);
    expect(low).toBeLessThan(IMPLAUSIBLE_DVO2_DWR_ML_MIN_W);
    const issue = r.issues.find((i) => i.code === "vo2-too-low-for-work")!;
    expect(issue.message).toContain(`VO2 rose only ${low.toFixed(1)} mL/min per W of work rate`);
    expect(r.issues.map((i) => i.code)).not.toContain("vo2-low-for-work");
    // shown: the values stay in the results and the draft; not read: the flow, patterns and schemes
    expect(r.indices.peaks.vo2MlMin.value).toBeCloseTo(good.indices.peaks.vo2MlMin.value! * 0.4, 6);
    const results = r.draft.sections.find((s) => s.id === "results")!.paragraphs;
    expect(results[0]).toMatch(/^Peak VO2 \d+ mL\/min/);
    expect(results).toContain(
      "VO2-based values are shown but not interpreted: VO2 rose too little with the work rate to be believed (see the issue on ΔVO2/ΔWR).",
    );
    expect(r.interpretation.path.steps.find((s) => s.nodeId === "peak-vo2")!.outcome).toBe("not-assessable");
    // the conclusion says why, where the reader looks first
    expect(r.draft.sections.find((s) => s.id === "conclusion")!.paragraphs).toContain(
      "VO2-based values are not interpreted: VO2 rose too little with the work rate to be believed (see the issue on ΔVO2/ΔWR). Check the cart and the ergometer, and repeat the test if the fault is confirmed.",
    );
    for (const p of r.interpretation.patterns)
      for (const f of [...p.for, ...p.against]) expect(f.text).not.toMatch(/^(Peak VO2|O2 pulse|ΔVO2\/ΔWR) [\d.]+/);
    const graded = r.interpretation.schemes.filter((x) => x.schemeId === "weber" || x.schemeId === "peak-vo2-grade");
    expect(graded.map((s) => s.schemeId).sort()).toEqual(["peak-vo2-grade", "weber"]);
    for (const s of graded) expect([s.schemeId, s.overall]).toEqual([s.schemeId, null]);
  });

  it("between 4.8 and 6.0 (a severe heart-failure-like slope) only a check is asked for: the reading stands", async () => {
    const base = { ...(await caseRecord("heart-failure")), referral: "heart-failure" as const };
    const slope = analyse(base).indices.dVo2dWr.whole.slope.value!;
    // scaled so the slope is 5.5 mL/min/W: between the two limits by construction
    const r = analyse(leaking(base, 5.5 / slope));
    expect(r.indices.dVo2dWr.whole.slope.value!).toBeCloseTo(5.5, 6);
    expect(r.indices.dVo2dWr.implausiblyLow).toBe(false);
    expect(r.issues.find((i) => i.code === "vo2-low-for-work")?.message).toMatch(
      /^VO2 rose only 5\.5 mL\/min per W .* Severe oxygen-delivery limitation can do this/,
    );
    expect(r.issues.map((i) => i.code)).not.toContain("vo2-too-low-for-work");
    expect(r.interpretation.path.steps.find((s) => s.nodeId === "peak-vo2")!.outcome).not.toBe("not-assessable");
    expect(["strong", "moderate"]).toContain(cardiovascular(r).support);
    expect(r.interpretation.schemes.find((s) => s.schemeId === "weber")!.overall).not.toBeNull();
    expect(SUSPECT_DVO2_DWR_ML_MIN_W).toBeGreaterThan(5.5);
  });

  it("real tests: a VO2 that rose 4.0 mL/min per W is flagged and not read as heart disease; a normal one is not flagged", async () => {
    const file = new Uint8Array(fs.readFileSync(path.resolve(__dirname, "../fixtures/open-data/actes/actes_test_measure.csv")));
    // ages, heights and weights from actes_subject-info.csv; sex is not in the set (male assumed, as a reviewer would ask)
    const read = async (id: string, ageY: number, heightCm: number, weightKg: number) => {
      const built = await buildRecord({
        bytes: file,
        fileName: "actes_test_measure.csv",
        patient: { sex: "male", ageY, heightCm, weightKg },
        ergometer: "cycle",
        referral: "general",
        importOptions: { select: { ID: id } },
      });
      return analyse(built.record!);
    };
    const nine = await read("9", 14, 176, 57.1);
    expect(nine.indices.dVo2dWr.whole.slope.value!).toBeLessThan(IMPLAUSIBLE_DVO2_DWR_ML_MIN_W);
    expect(nine.issues.map((i) => i.code)).toContain("vo2-too-low-for-work");
    expect(["strong", "moderate", "weak"]).not.toContain(cardiovascular(nine).support);
    const thirteen = await read("13", 18, 183, 83.9);
    expect(thirteen.indices.dVo2dWr.whole.slope.value!).toBeGreaterThan(9);
    expect(thirteen.issues.map((i) => i.code)).not.toContain("vo2-too-low-for-work");
  }, 30_000);
});
