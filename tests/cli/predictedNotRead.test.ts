/**
 * The CLI JSON says, beside each % predicted, whether the interpretation reads it (`predicted.<q>.notRead`), so a script
 * reading the JSON does not grade a value the report declines to grade. Input: the INVENTED normal and heart-failure
 * demo cases (tests/fixtures/cases), run in-process; the patient details are changed here to reach each reason.
 */
import path from "node:path";
import { describe, expect, it } from "vitest";
import { formatText, runAnalyse } from "../../cli/analyse";
import { BETA_BLOCKER_HR_NOTE } from "../../lib/interpret";

const cases = path.resolve(__dirname, "../fixtures/cases");
const base = { json: true, sex: "male", heightCm: 174, weightKg: 80, ergometer: "cycle", select: {}, referral: "general" };

describe("predicted.<quantity>.notRead", () => {
  it("is null for an adult read against adult equations, and the text shows no 'not read'", async () => {
    const j = await runAnalyse(path.join(cases, "normal-adult.csv"), { ...base, age: 45 });
    for (const q of ["vo2PeakMlMin", "hrMaxBpm", "o2PulseMaxMlBeat"]) {
      expect(j.predicted[q]?.percentPredicted).not.toBeNull();
      expect(j.predicted[q]?.notRead).toBeNull();
    }
    expect(formatText(j)).not.toContain("not read");
  }, 60_000);

  it("names the adult-only equation for a 15-year-old (under 18: ADULT_AGE_Y), in the JSON and the text", async () => {
    const j = await runAnalyse(path.join(cases, "normal-adult.csv"), { ...base, age: 15 });
    // the % is still given; only its reading is withheld
    expect(j.predicted.vo2PeakMlMin?.percentPredicted).not.toBeNull();
    expect(j.predicted.vo2PeakMlMin?.notRead).toMatch(/derived in adults/);
    expect(j.predicted.hrMaxBpm?.notRead).toMatch(/derived in adults/);
    expect(formatText(j)).toMatch(/% predicted \([a-z0-9-]+; not read: .*derived in adults/);
  }, 60_000);

  it("gives the beta-blocker reason for heart rate only, and the text does not say it twice", async () => {
    const j = await runAnalyse(path.join(cases, "heart-failure.csv"), { ...base, age: 62, betaBlocker: true });
    expect(j.predicted.hrMaxBpm?.notRead).toBe(BETA_BLOCKER_HR_NOTE);
    expect(j.predicted.vo2PeakMlMin?.notRead).toBeNull();
    // the lab's default predicted O2 pulse is predicted peak VO2 ÷ predicted maximal heart rate (o2pulse-derived)
    expect(j.predicted.o2PulseMaxMlBeat?.equationId).toBe("o2pulse-derived");
    expect(j.predicted.o2PulseMaxMlBeat?.notRead).toMatch(
      /age-predicted maximal heart rate, which does not apply on a beta-blocker/,
    );
    const text = formatText(j, { betaBlocker: true });
    expect(text.split(BETA_BLOCKER_HR_NOTE).length - 1).toBe(1);
  }, 60_000);
});
