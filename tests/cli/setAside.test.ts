/**
 * `--set-aside m:ss-m:ss` on a real recording: ACTES test 4's peak 30-s VO2 is carried by six breaths at 2.9-3.4 L/min
 * among neighbours near 2.4 (1037-1047 s, 113 s before the end of exercise). A clinical reviewer recomputed peak VO2 by
 * hand with those breaths set aside: 2 654 mL/min (their own time-weighted 30-s average; secondary to this code).
 */
import path from "node:path";
import { describe, expect, it } from "vitest";
import { runAnalyse } from "../../cli/analyse";
import { UsageError } from "../../cli/usageError";

// Chabert C, Mongin D, Hermand E, Collado A, Hue O. Cardiorespiratory measurement from graded
// cycloergometer exercise testing (version 1.0.0). PhysioNet; 2022. https://doi.org/10.13026/2qs3-kh43.
// Licensed under the Open Data Commons Attribution License v1.0.
const file = path.resolve(__dirname, "../fixtures/open-data/actes/actes_vo2_breaths_derived.csv");
const base = {
  json: true,
  sex: "male",
  age: 16,
  heightCm: 170,
  weightKg: 60,
  ergometer: "cycle",
  referral: "general",
  select: { ID: "4" },
};

describe("--set-aside on ACTES test 4 (ODC-By 1.0)", () => {
  it("without it the early burst sets peak VO2 and is flagged; with it peak VO2 is within 1 % of the hand value", async () => {
    const plain = await runAnalyse(file, base);
    expect(plain.issues.some((i) => i.code === "peak-vo2-before-end")).toBe(true);
    const cleaned = await runAnalyse(file, { ...base, setAside: [{ startS: 1036, endS: 1048 }] });
    expect(plain.peak.vo2MlMin! - cleaned.peak.vo2MlMin!).toBeGreaterThan(100);
    expect(Math.abs(cleaned.peak.vo2MlMin! - 2654) / 2654).toBeLessThan(0.01);
    expect(cleaned.issues.some((i) => i.code === "peak-vo2-before-end")).toBe(false);
    expect(cleaned.issues.find((i) => i.code === "breaths-set-aside-by-review")?.message).toMatch(
      /^The gas and ventilation values of 6 breath\(s\) from 17:16 to 17:28 were set aside by review: set with --set-aside\./,
    );
  }, 60_000);

  it("a span outside the record is refused as a usage error, naming the record's span", async () => {
    await expect(runAnalyse(file, { ...base, setAside: [{ startS: 5000, endS: 5100 }] })).rejects.toThrow(UsageError);
    await expect(runAnalyse(file, { ...base, setAside: [{ startS: 5000, endS: 5100 }] })).rejects.toThrow(
      /^--set-aside 83:20-85:00 does not lie inside the record/,
    );
  }, 60_000);

  it("a span before 0:00 (this file counts from the start of exercise) is written with a minus and read", async () => {
    const r = await runAnalyse(file, { ...base, setAside: [{ startS: -120, endS: -60 }] });
    expect(r.issues.find((i) => i.code === "breaths-set-aside-by-review")?.message).toMatch(/from -2:00 to -1:00/);
  }, 60_000);

  it("a span over more than half of the exercise phase is refused: such a test is repeated, not analysed without its exercise", async () => {
    await expect(runAnalyse(file, { ...base, setAside: [{ startS: 181, endS: 1168 }] })).rejects.toThrow(
      /^--set-aside 3:01-19:28 would set aside more than half of the exercise phase/,
    );
  }, 60_000);

  it("two spans that together cover most of the exercise phase are refused as one", async () => {
    await expect(
      runAnalyse(file, {
        ...base,
        setAside: [
          { startS: 181, endS: 659 },
          { startS: 659, endS: 1140 },
        ],
      }),
    ).rejects.toThrow(/^--set-aside 3:01-10:59, 10:59-19:00 would set aside more than half of the exercise phase/);
  }, 60_000);

  it("--set-aside-hr on a file without heart rate says there was none to set aside", async () => {
    const r = await runAnalyse(file, { ...base, setAsideHr: [{ startS: 600, endS: 660 }] });
    const said = r.issues.find((i) => i.code === "breaths-set-aside-by-review")!;
    expect(said.severity).toBe("warning");
    expect(said.message).toBe("The span set aside by review, 10:00 to 11:00, holds no heart rate: nothing was set aside there.");
  }, 60_000);
});
