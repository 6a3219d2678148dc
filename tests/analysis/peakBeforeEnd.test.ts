/**
 * A peak-VO2 window that ends long before the end of exercise is flagged (`peak-vo2-before-end`, more than
 * `PEAK_VO2_EARLY_S`). By construction on an INVENTED demo case (tests/fixtures/cases) with a burst of high breaths put
 * 150 s before the end, and on the real ACTES test 4 (Chabert C, Mongin D, Hermand E, Collado A, Hue O.
 * Cardiorespiratory measurement from graded cycloergometer exercise testing, v1.0.0, PhysioNet 2022,
 * doi:10.13026/2qs3-kh43; ODC-By 1.0), where a clinical review found six breaths of 2.9–3.4 L/min among about 2.4.
 */
import fs from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { analyse, buildRecord } from "../../lib/analysis";
import { PEAK_VO2_EARLY_S } from "../../lib/thresholds/measurePeaks";
import { formatClock } from "../../lib/units";
import { caseRecord } from "../fixtures/caseRecord";

const flagged = (r: ReturnType<typeof analyse>) => r.issues.find((i) => i.code === "peak-vo2-before-end");

describe("a peak VO2 window long before the end of exercise", () => {
  it("a burst of breaths 150 s before the end is flagged, with its window; the untouched test is not", async () => {
    const base = await caseRecord("normal-adult");
    const clean = analyse(base);
    expect(flagged(clean)).toBeUndefined();
    const end = clean.indices.peaks.vo2MlMin.provenance.window!.endS; // the clean peak window ends with exercise
    // INVENTED burst: every breath within 12 s of (end − 150 s) raised by 1500 mL/min
    const at = end - 150;
    const rows = base.table.rows.map((r) =>
      Math.abs(r.timeS - at) <= 12 && r.vo2MlMin !== undefined ? { ...r, vo2MlMin: r.vo2MlMin + 1500 } : r,
    );
    const burst = analyse({ ...base, table: { ...base.table, rows } });
    const issue = flagged(burst)!;
    expect(issue.severity).toBe("warning");
    const win = burst.indices.peaks.vo2MlMin.provenance.window!;
    expect(Math.abs((win.startS + win.endS) / 2 - at)).toBeLessThan(20);
    expect(end - win.endS).toBeGreaterThan(PEAK_VO2_EARLY_S);
    expect(issue.message).toContain(`${formatClock(win.startS)}–${formatClock(win.endS)})`);
  });

  it("real test: ACTES 4's peak window, 113 s before the end, is flagged; ACTES 13's is not", async () => {
    const file = new Uint8Array(fs.readFileSync(path.resolve(__dirname, "../fixtures/open-data/actes/actes_test_measure.csv")));
    const read = async (id: string) => {
      const built = await buildRecord({
        bytes: file,
        fileName: "actes_test_measure.csv",
        patient: { sex: "male", ageY: 16, heightCm: 175, weightKg: 60 },
        ergometer: "cycle",
        referral: "general",
        importOptions: { select: { ID: id } },
      });
      return analyse(built.record!);
    };
    expect(flagged(await read("4"))?.message).toMatch(/ends 113 s before the end of exercise/);
    expect(flagged(await read("13"))).toBeUndefined();
  }, 30_000);
});
