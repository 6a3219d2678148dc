import { describe, expect, it } from "vitest";
import { compareTests, composeDraft, DRAFT_BANNER, interpret } from "../../lib/interpret";
import { baseInput, loadFixture } from "./helpers";

describe("draft report text", () => {
  const fx = loadFixture("heart-failure"); // INVENTED patient
  const r = interpret(fx.input);

  it("is a draft, says so in the text, and carries the clinician-review caution", () => {
    const d = composeDraft(fx.input, r);
    expect(d.status).toBe("draft");
    expect(d.banner).toBe("DRAFT — not a final report until it has been reviewed and signed by a qualified clinician.");
    expect(d.sections[0].title).toBe(DRAFT_BANNER);
    const caution = d.sections.find((s) => s.id === "caution")!.paragraphs.join(" ");
    expect(caution).toMatch(/reviewed by a qualified clinician/);
    expect(caution).toMatch(/local protocols and licensed practice prevail/);
  });

  it("gives a duration in whole minutes and seconds, rounding the total first (1079.6 s is 18 min 0 s, not 17 min 60 s)", () => {
    const conduct = (s: number) =>
      composeDraft(fx.input, r, { testConduct: { exerciseDurationS: s } }).sections.find((x) => x.id === "conduct")!;
    expect(conduct(1079.6).paragraphs[0]).toContain("Exercise lasted 18 min 0 s.");
    expect(conduct(1079.4).paragraphs[0]).toContain("Exercise lasted 17 min 59 s.");
    expect(conduct(512).paragraphs[0]).toContain("Exercise lasted 8 min 32 s.");
  });

  it("has the sections in report order as editable title + paragraphs", () => {
    const d = composeDraft(fx.input, r, {
      testConduct: {
        protocol: "cycle ramp 10 W/min",
        exerciseDurationS: 512,
        reasonForStopping: "leg fatigue and breathlessness",
        peakBorg: 17,
      },
      thresholdMethods: { vt1: "V-slope, agreeing with the ventilatory equivalents" },
      domains: [{ name: "Moderate (below VT1)", hrFromBpm: 80, hrToBpm: 98, workFromW: 20, workToW: 45 }],
    });
    expect(d.sections.map((s) => s.id)).toEqual([
      "status",
      "referral",
      "conduct",
      "results",
      "thresholds",
      "pathway",
      "patterns",
      "schemes",
      "prescription",
      "conclusion",
      "caution",
    ]);
    for (const s of d.sections.slice(1)) {
      expect(s.title.length).toBeGreaterThan(3);
      expect(s.paragraphs.length).toBeGreaterThan(0);
    }
    const text = JSON.stringify(d);
    expect(text).toMatch(/Peak VO2 1150 mL\/min, 14\.0 mL\/kg\/min, 47 % of predicted \(Hansen 1984\)/);
    expect(text).toMatch(/8 min 32 s/);
    expect(text).toMatch(/Moderate \(below VT1\): heart rate 80–98 bpm, work rate 20–45 W/);
    expect(d.sections.find((s) => s.id === "conclusion")!.paragraphs.join(" ")).toMatch(/consistent with a cardiovascular/);
  });

  it("open-ended domain ranges read as the domains table does: 'up to' and 'from', never '…'", () => {
    const d = composeDraft(fx.input, r, {
      domains: [
        { name: "Moderate (below VT1)", hrToBpm: 122, workToW: 90 },
        { name: "Heavy (VT1 to VT2)", hrFromBpm: 122, hrToBpm: 158, workFromW: 90, workToW: 160 },
        { name: "Severe (above VT2)", hrFromBpm: 158, workFromW: 160 },
      ],
    });
    const rx = d.sections.find((s) => s.id === "prescription")!.paragraphs.join(" ");
    expect(rx).toMatch(/Moderate \(below VT1\): heart rate up to 122 bpm, work rate up to 90 W on the ramp\./);
    expect(rx).toMatch(/Heavy \(VT1 to VT2\): heart rate 122–158 bpm, work rate 90–160 W on the ramp\./);
    expect(rx).toMatch(/Severe \(above VT2\): heart rate from 158 bpm, work rate from 160 W on the ramp\./);
    expect(rx).not.toMatch(/…/);
    expect(rx).toMatch(/the lag could not be measured on this test/);
  });

  it("with the ramp's VO2 lag measured, constant-load work rates stand beside the ramp's (invented values)", () => {
    // invented: a 10 W/min ramp and a 60-s lag move each bound 10 W down
    const d = composeDraft(fx.input, r, {
      domains: [
        { name: "Moderate (below VT1)", hrToBpm: 105, workToW: 62, heldToW: 52 },
        { name: "Heavy (VT1 to VT2)", hrFromBpm: 105, hrToBpm: 130, workFromW: 62, workToW: 90, heldFromW: 52, heldToW: 80 },
        { name: "Severe (above VT2)", hrFromBpm: 130, workFromW: 90, workToW: 110, heldFromW: 80 },
      ],
      rampLag: { lagS: 60, shiftW: 10, spreadS: 40, spreadW: 6.7 },
    });
    const rx = d.sections.find((s) => s.id === "prescription")!.paragraphs.join(" ");
    expect(rx).toMatch(
      /Moderate \(below VT1\): heart rate up to 105 bpm, work rate up to 62 W on the ramp \(up to 52 W at constant load\)\./,
    );
    expect(rx).toMatch(/work rate 62–90 W on the ramp \(52–80 W at constant load\)/);
    expect(rx).toMatch(/work rate 90–110 W on the ramp \(from 80 W at constant load\)/);
    expect(rx).toMatch(
      /VO2 lagged this ramp by about 60 s, so the work rate held at constant load for the same intensity is about 10 W lower/,
    );
    expect(rx).toMatch(
      /may be off by 40 s \(7 W here\), so those work rates are approximate: set constant-load training by heart rate/,
    );
  });

  it("a treadmill prescription gives the speed with its grade (invented ranges)", () => {
    const d = composeDraft(fx.input, r, {
      domains: [
        { name: "Moderate (below VT1)", hrToBpm: 118, speedToKmh: 5.9, gradeToPct: 7.6 },
        {
          name: "Heavy (VT1 to VT2)",
          hrFromBpm: 118,
          hrToBpm: 151,
          speedFromKmh: 5.9,
          speedToKmh: 7.2,
          gradeFromPct: 7.6,
          gradeToPct: 12.8,
        },
      ],
    });
    const rx = d.sections.find((s) => s.id === "prescription")!.paragraphs.join(" ");
    expect(rx).toMatch(/Moderate \(below VT1\): heart rate up to 118 bpm, speed up to 5\.9 km\/h, grade up to 7\.6 %\./);
    expect(rx).toMatch(/Heavy \(VT1 to VT2\): heart rate 118–151 bpm, speed 5\.9–7\.2 km\/h, grade 7\.6–12\.8 %\./);
  });

  it("a treadmill test without a work rate states its highest load as speed with grade (invented values)", () => {
    const { peakWorkW: _w, ...values } = fx.input.values;
    const tm = { ...fx.input, ergometer: "treadmill" as const, values: { ...values, peakSpeedKmh: 6, peakGradePct: 10 } };
    const res = composeDraft(tm, interpret(tm))
      .sections.find((s) => s.id === "results")!
      .paragraphs.join(" ");
    expect(res).toContain("Final treadmill stage 6.0 km/h at 10.0 % grade.");
    expect(res).not.toMatch(/Peak work rate/);
    // a cycle test keeps its work rate and says nothing of speed
    const cyc = composeDraft(fx.input, r)
      .sections.find((s) => s.id === "results")!
      .paragraphs.join(" ");
    expect(cyc).toMatch(/Peak work rate 85 W\./);
    expect(cyc).not.toMatch(/treadmill stage/);
  });

  it("VT1 is stated with its heart rate and work rate, as VT2 is (invented values)", () => {
    const d = composeDraft(fx.input, r, { vt1: { hrBpm: 105, workW: 62 }, vt2: { vo2MlMin: 1000, hrBpm: 125, workW: 85 } });
    const thr = d.sections.find((s) => s.id === "thresholds")!.paragraphs;
    expect(thr.find((p) => p.startsWith("VT1 at VO2"))).toMatch(/, heart rate 105 bpm, 62 W\.$/);
    expect(thr.find((p) => p.startsWith("VT2"))).toMatch(/heart rate 125 bpm, 85 W\.$/);
  });

  it("on a treadmill the thresholds' load is the speed with its grade (invented values)", () => {
    const d = composeDraft(fx.input, r, {
      vt1: { hrBpm: 118, speedKmh: 5.9, gradePct: 7.6 },
      vt2: { vo2MlMin: 1500, hrBpm: 151, speedKmh: 7.2, gradePct: 12.8 },
    });
    const thr = d.sections.find((s) => s.id === "thresholds")!.paragraphs;
    expect(thr.find((p) => p.startsWith("VT1 at VO2"))).toMatch(/, heart rate 118 bpm, 5\.9 km\/h at 7\.6 % grade\.$/);
    expect(thr.find((p) => p.startsWith("VT2"))).toMatch(/heart rate 151 bpm, 7\.2 km\/h at 12\.8 % grade\.$/);
  });

  it("a training referral with thresholds out of order says why there is no prescription", () => {
    const training = { ...fx.input, referral: "training" as const };
    const withheld =
      "Intensity domains are not given: VT2 does not lie above VT1 (in VO2 or in time), so at least one of them is wrong.";
    const rx = (extras: Parameters<typeof composeDraft>[2]) =>
      composeDraft(training, interpret(training), extras)
        .sections.find((s) => s.id === "prescription")!
        .paragraphs.join(" ");
    expect(rx({ domains: [], domainsWithheld: withheld })).toBe(withheld);
    expect(rx({ domains: [] })).toBe("Intensity domains were not available; a prescription needs VT1 and VT2.");
  });

  it("a submaximal test says that only effort-independent variables were interpreted", () => {
    const input = baseInput({ peakRer: 0.95, hrPctPred: 70, hrReserveBpm: 50 });
    const d = composeDraft(input, interpret(input));
    const conduct = d.sections.find((s) => s.id === "conduct")!.paragraphs.join(" ");
    expect(conduct).toMatch(/only effort-independent variables \(VE\/VCO2 slope, OUES and VT1\)/);
    expect(d.sections.find((s) => s.id === "conclusion")!.paragraphs.join(" ")).toMatch(/effort was submaximal/);
  });

  it("includes a serial comparison and lists non-default cut-off choices", () => {
    // +3.5 mL/kg/min, above the 3.0 band (Bensimhon 2008 90th percentile of HF retest change, confirmed)
    const after = { ...fx.input, values: { ...fx.input.values, peakVo2MlKgMin: fx.input.values.peakVo2MlKgMin! + 3.5 } };
    const cmp = compareTests(fx.input, after, "heart-failure");
    const r2 = interpret(fx.input, { choices: { "rer-maximal": "at-least-1.10" } });
    const d = composeDraft(fx.input, r2, { comparison: cmp });
    expect(d.sections.find((s) => s.id === "serial")!.paragraphs.join(" ")).toMatch(/beyond measurement noise/);
    expect(d.sections.find((s) => s.id === "caution")!.paragraphs.join(" ")).toMatch(/Peak RER ≥ 1.10/);
    expect(d.sourceIds).toContain("bensimhon-2008");
  });
});
