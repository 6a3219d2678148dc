import { describe, expect, it } from "vitest";
import {
  BETA_BLOCKER_HR_NOTE,
  BETA_BLOCKER_HR_REACHED_NOTE,
  BETA_BLOCKER_ONE_SIDED,
  composeDraft,
  interpret,
} from "../../lib/interpret";
import { baseInput } from "./helpers";

// INVENTED inputs. The name below is the thresholds layer's wording for a VE/VCO2 slope fitted to a break the fit placed
// when VT2 was not determinable (slopeToVt2Name); the analysis passes it as InterpretInput.names.
const FITTED_BREAK = "VE/VCO2 slope to a fitted break (RCP not determinable)";

describe("a value is named for what it was measured as (InterpretInput.names)", () => {
  const values = { veVco2SlopeWhole: 39.8, veVco2SlopeToRcp: 37.7 };

  it("the draft gives the slope to VT2 under its measured name, never '(to RCP)'", () => {
    const input = baseInput(values, { names: { veVco2SlopeToRcp: FITTED_BREAK } });
    const results = composeDraft(input, interpret(input))
      .sections.find((s) => s.id === "results")!
      .paragraphs.join(" ");
    expect(results).toContain(`VE/VCO2 slope 39.8 (whole exercise), ${FITTED_BREAK} 37.7`);
    expect(results).not.toContain("(to RCP)");
  });

  it("without a name the vocabulary label is used", () => {
    const input = baseInput(values);
    const results = composeDraft(input, interpret(input))
      .sections.find((s) => s.id === "results")!
      .paragraphs.join(" ");
    expect(results).toContain("VE/VCO2 slope (start to RCP) 37.7");
  });

  it("rule and scheme texts read the measured name too (lab setting: slope to RCP for the ventilatory class)", () => {
    // Arena et al. 2007, Circulation (confirmed): 37.7 lies in class III (36.0-44.9)
    const input = { ...baseInput(values, { names: { veVco2SlopeToRcp: FITTED_BREAK } }), referral: "heart-failure" as const };
    const r = interpret(input, { choices: { "vevco2-slope-definition": "to-rcp" } });
    const arena = r.schemes.find((s) => s.schemeId === "arena-ventilatory-class")!.axes[0];
    expect(arena.category?.key).toBe("VC-III");
    expect(arena.text).toContain(`${FITTED_BREAK} 37.7 ≥ 36.0`);
    expect(JSON.stringify(r)).not.toContain("start to RCP");
  });
});

describe("beta-blocker: heart rate is shown but not read against the age-predicted maximum (common practice)", () => {
  it("the draft's peak heart rate carries the note on a beta-blocker only", () => {
    const on = baseInput({ peakHrBpm: 133, hrPctPred: null }, { patient: { sex: "male", ageY: 62, betaBlocker: true } });
    const off = baseInput({ peakHrBpm: 133, hrPctPred: 84 });
    const text = (i: typeof on) =>
      composeDraft(i, interpret(i))
        .sections.find((s) => s.id === "results")!
        .paragraphs.find((p) => p.startsWith("Peak heart rate"))!;
    expect(text(on)).toBe(`Peak heart rate 133 bpm (${BETA_BLOCKER_HR_NOTE}).`);
    expect(text(off)).toBe("Peak heart rate 133 bpm (84 % of predicted).");
  });
});

describe("beta-blocker: heart rate read on one side only (common practice; INVENTED values)", () => {
  const blocked = { patient: { sex: "male" as const, ageY: 62, betaBlocker: true } };
  // peak RER 1.03: below the default maximal cut-off (> 1.05, Radtke et al. 2019, confirmed), so effort rests on the rest
  const input = (hrPctPred: number, hrReserveBpm: number) =>
    baseInput({ peakRer: 1.03, peakHrBpm: 140, hrPctPred, hrReserveBpm, veMvvPct: 60, vo2Plateau: false, spo2Fall: 1 }, blocked);
  const effortOf = (i: ReturnType<typeof input>) => interpret(i).effort;

  it("a heart rate that reaches the predicted range despite the drug counts as a sign of effort", () => {
    const e = effortOf(input(90, 16));
    expect(e.verdict).toBe("physiological-limit");
    expect(e.criteria.find((c) => c.ruleId === "hr-reached")!.outcome).toBe(true);
    const i = input(90, 16);
    const hrLine = composeDraft(i, interpret(i))
      .sections.find((s) => s.id === "results")!
      .paragraphs.find((p) => p.startsWith("Peak heart rate"))!;
    expect(hrLine).toContain("90 % of predicted");
    expect(hrLine).toContain(BETA_BLOCKER_HR_REACHED_NOTE);
    expect(hrLine).not.toContain(BETA_BLOCKER_HR_NOTE);
  });

  it("one short of it is not assessable, never 'well below predicted', and the draft gives no % (the same value without the drug is read)", () => {
    const e = effortOf(input(72, 45));
    const hr = e.criteria.find((c) => c.ruleId === "hr-reached")!;
    expect(hr.outcome).toBeNull();
    expect(hr.text).toContain(BETA_BLOCKER_ONE_SIDED);
    expect(e.verdict).toBe("submaximal");
    const plain = interpret(baseInput({ peakRer: 1.03, hrPctPred: 72, hrReserveBpm: 45, veMvvPct: 60, vo2Plateau: false }));
    expect(plain.effort.criteria.find((c) => c.ruleId === "hr-reached")!.outcome).toBe(false);
    const i = input(72, 45);
    const hrLine = composeDraft(i, interpret(i))
      .sections.find((s) => s.id === "results")!
      .paragraphs.find((p) => p.startsWith("Peak heart rate"))!;
    expect(hrLine).not.toMatch(/% of predicted/);
    expect(hrLine).toContain(BETA_BLOCKER_HR_NOTE);
  });
});

describe("Arena ventilatory classes say what their percentage is", () => {
  // Arena R et al. 2007, Circulation (PMID 17452607), as in the clinical reference §3.2 (confirmed):
  // 2-year event-free survival 97.2 % (VC-I), 85.2 % (VC-II), 72.3 % (VC-III), 44.2 % (VC-IV).
  const published: [number, string, string][] = [
    [27, "VC-I", "97.2 %"],
    [33, "VC-II", "85.2 %"],
    [39.8, "VC-III", "72.3 %"],
    [47, "VC-IV", "44.2 %"],
  ];
  it.each(published)("slope %s: %s with its 2-y event-free survival %s", (slope, key, survival) => {
    const input = { ...baseInput({ veVco2SlopeWhole: slope }), referral: "heart-failure" as const };
    const axis = interpret(input).schemes.find((s) => s.schemeId === "arena-ventilatory-class")!.axes[0];
    expect(axis.category?.key).toBe(key);
    expect(axis.category?.label).toContain(`2-y event-free survival ${survival}`);
  });
});
