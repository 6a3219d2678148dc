/**
 * A beta-blocker, given on the command line, reaches the heart-rate criteria: predicted-HRmax equations do not describe
 * a beta-blocked heart (common practice), so peak HR % predicted is not read as a sign of effort or of chronotropic
 * incompetence. Input: the INVENTED heart-failure demo case (tests/fixtures/cases), run in-process.
 */
import path from "node:path";
import { describe, expect, it } from "vitest";
import { formatText, runAnalyse } from "../../cli/analyse";
import { BETA_BLOCKER_HR_NOTE } from "../../lib/interpret";

const file = path.resolve(__dirname, "../fixtures/cases/heart-failure.csv");
const base = {
  json: true,
  sex: "male",
  age: 62,
  heightCm: 174,
  weightKg: 80,
  ergometer: "cycle",
  referral: "heart-failure",
  select: {},
};

describe("--beta-blocker", () => {
  it("without it the HR criterion is read (84 % predicted, below 85 %); with it a criterion not met is not assessable, and says why", async () => {
    const plain = await runAnalyse(file, base);
    const blocked = await runAnalyse(file, { ...base, betaBlocker: true });
    const effort = (j: Awaited<ReturnType<typeof runAnalyse>>) => (j.interpretation as { effort: { text: string } }).effort.text;
    // the demo's peak HR against ERS 2019 Table 3 (men 207 − 0.78·age; Radtke et al. 2019, confirmed) is under 85 %
    expect(effort(plain)).toMatch(/Peak HR \d+ % predicted .*< 85 % predicted/);
    expect(effort(blocked)).toMatch(
      /Peak HR \d+ % predicted not read against 85 % predicted \(the patient takes a beta-blocker, which lowers heart rate: only a heart rate that reaches the cut-off is read\) → not assessable/,
    );
    // the measured values themselves are the same: only how they are read changes
    expect(blocked.heartRate.percentPredicted).toBe(plain.heartRate.percentPredicted);
    expect(blocked.peak.hrBpm).toBe(plain.peak.hrBpm);
  }, 60_000);

  it("the text summary says it beside the heart rate, as the page and the report do", async () => {
    const blocked = await runAnalyse(file, { ...base, betaBlocker: true });
    const text = formatText(blocked, { betaBlocker: true });
    expect(text).toMatch(new RegExp(`HR \\d+ bpm, \\d+ % predicted \\([a-z0-9-]+\\) \\(${BETA_BLOCKER_HR_NOTE}\\)`));
    // without the option the JSON still says why heart rate is not read (predicted.hrMaxBpm.notRead), once
    expect(formatText(blocked).split(BETA_BLOCKER_HR_NOTE).length - 1).toBe(1);
    const plain = await runAnalyse(file, base);
    expect(formatText(plain)).not.toContain(BETA_BLOCKER_HR_NOTE);
  }, 60_000);
});
