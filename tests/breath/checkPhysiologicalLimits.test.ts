/**
 * Physiological plausibility screen (common practice; limits in lib/breath/checkPhysiologicalLimits.ts)
 * and the minimum recording length (8 min, the lower end of the 8–12 min incremental phase of the ERS
 * statement, Radtke et al. 2019 Eur Respir Rev 28:180101, confirmed). All inputs are INVENTED rows whose
 * answer is known by construction.
 */
import { describe, expect, it } from "vitest";
import { checkPhysiologicalLimits, importBreathFile, MIN_TEST_DURATION_S, PHYSIOLOGICAL_LIMITS } from "../../lib/breath";
import type { BreathRow } from "../../lib/breath";

/** A 12-min breath series every 5 s (145 rows), all values well inside the limits. */
function normalRows(): BreathRow[] {
  const rows: BreathRow[] = [];
  for (let i = 0; i <= 144; i++) {
    const t = i * 5;
    rows.push({ timeS: t, sourceRow: i + 2, vo2MlMin: 400 + 3 * t, veLMin: 10 + 0.1 * t, hrBpm: 70 + 0.12 * t });
  }
  return rows;
}

const enc = (s: string) => new TextEncoder().encode(s);

describe("checkPhysiologicalLimits (invented rows)", () => {
  it("the limits are the stated ones", () => {
    // common practice: VO2 7000 mL/min and 90 mL/kg/min, VE 300 L/min, HR 25–230 beats/min
    expect(PHYSIOLOGICAL_LIMITS.vo2MlMin.max).toBe(7000);
    expect(PHYSIOLOGICAL_LIMITS.vo2MlKgMin.max).toBe(90);
    expect(PHYSIOLOGICAL_LIMITS.veLMin.max).toBe(300);
    expect(PHYSIOLOGICAL_LIMITS.hrBpm).toEqual({ min: 25, max: 230 });
    expect(MIN_TEST_DURATION_S).toBe(480); // 8 min (ERS 2019)
  });

  it("a plausible 12-min series raises nothing", () => {
    // highest values by construction: VO2 400 + 3·720 = 2560 mL/min, VE 82 L/min, HR 156.4; span 720 s ≥ 480 s
    expect(checkPhysiologicalLimits(normalRows(), { weightKg: 75 })).toEqual([]);
  });

  it("flags each field beyond its limit, naming the column, the limit, the count and the first row", () => {
    const rows = normalRows();
    rows[100] = { ...rows[100], vo2MlMin: 7200 }; // source row 102
    rows[101] = { ...rows[101], vo2MlMin: 7600 };
    rows[50] = { ...rows[50], veLMin: 320 }; // source row 52
    rows[10] = { ...rows[10], hrBpm: 240 }; // source row 12
    rows[11] = { ...rows[11], hrBpm: 20 }; // source row 13
    Object.freeze(rows);
    const issues = checkPhysiologicalLimits(rows, { headers: { vo2MlMin: "V'O2", veLMin: "VE", hrBpm: "HF" } });
    const byField = new Map(issues.map((i) => [i.where?.field, i]));
    const vo2 = byField.get("vo2MlMin")!;
    // two isolated breaths (fewer than 3 and under 1 % of the rows): artefacts, an info line
    expect(vo2.severity).toBe("info");
    expect(vo2.message).toContain("Isolated breaths");
    expect(vo2.code).toBe("beyond-physiological-limit");
    expect(vo2.where).toEqual({ column: "V'O2", row: 102, field: "vo2MlMin" });
    expect(vo2.message).toContain("2 value(s) above 7000 mL/min (highest 7600)");
    expect(vo2.message).toContain("physiological plausibility");
    expect(byField.get("veLMin")!.message).toContain('"VE": 1 value(s) above 300 L/min (highest 320)');
    const hr = byField.get("hrBpm")!;
    expect(hr.message).toContain("1 value(s) above 230 beats/min (highest 240) and 1 value(s) below 25 beats/min (lowest 20)");
    expect(hr.where?.row).toBe(12);
    // no per-kg issue: no weight given and no per-kg column
    expect(byField.has("vo2MlKgMin")).toBe(false);
    expect(issues).toHaveLength(3);
    // input not mutated
    expect(rows[100].vo2MlMin).toBe(7200);
  });

  it("values beyond the limit in more than 1 % of the rows point to a wrong column or unit: a warning", () => {
    const rows = normalRows();
    const n = Math.max(3, Math.ceil(0.02 * rows.length)); // 2 % of the rows, at least 3
    for (let i = 0; i < n; i++) rows[20 + i] = { ...rows[20 + i], vo2MlMin: 7500 };
    const [vo2] = checkPhysiologicalLimits(rows);
    expect(vo2.severity).toBe("warning");
    expect(vo2.message).toContain(`${n} value(s) above 7000 mL/min (highest 7500)`);
    expect(vo2.message).toContain("results computed from it are not reliable");
  });

  it("per kg: absolute VO2 ÷ body mass, or a per-kg column as given", () => {
    const rows = normalRows();
    // 5000 mL/min ÷ 50 kg = 100 mL/kg/min > 90; below the absolute limit of 7000 mL/min
    rows[120] = { ...rows[120], vo2MlMin: 5000 };
    const withWeight = checkPhysiologicalLimits(rows, { weightKg: 50 });
    expect(withWeight).toHaveLength(1);
    expect(withWeight[0].where?.field).toBe("vo2MlKgMin");
    expect(withWeight[0].message).toContain("VO2 ÷ body mass 50 kg");
    expect(withWeight[0].message).toContain("above 90 mL/kg/min (highest 100)");
    // 5000 ÷ 75 = 66.7 mL/kg/min: inside
    expect(checkPhysiologicalLimits(rows, { weightKg: 75 })).toEqual([]);
    const perKg = normalRows().map((r) => ({ ...r, vo2MlKgMin: r.vo2MlMin! / 70 }));
    perKg[3] = { ...perKg[3], vo2MlKgMin: 95 };
    const got = checkPhysiologicalLimits(perKg);
    expect(got.map((i) => i.where?.field)).toEqual(["vo2MlKgMin"]);
  });

  it("a recording shorter than 8 min is flagged; stage rows count one stage spacing more", () => {
    // breaths every 5 s for 400 s: span 400 s < 480 s
    const short = normalRows().filter((r) => r.timeS <= 400);
    const s = checkPhysiologicalLimits(short);
    expect(s.map((i) => i.code)).toEqual(["short-recording"]);
    expect(s[0].message).toContain("6.7 min"); // 400 s / 60 = 6.67 min
    // 7 stages 60 s apart: span 360 s + one 60-s stage = 420 s < 480 s → flagged; 8 stages: 420 + 60 = 480 → not
    const stages = (n: number): BreathRow[] => Array.from({ length: n }, (_, i) => ({ timeS: i * 60, vo2MlMin: 800 + 200 * i }));
    expect(checkPhysiologicalLimits(stages(7), { shape: "stage" }).map((i) => i.code)).toEqual(["short-recording"]);
    expect(checkPhysiologicalLimits(stages(8), { shape: "stage" })).toEqual([]);
    // as breaths, 8 rows 60 s apart span only 420 s
    expect(checkPhysiologicalLimits(stages(8)).map((i) => i.code)).toEqual(["short-recording"]);
  });

  it("breaths far faster than anyone breathes: the time column is probably in minutes, and the message says so", () => {
    // 400 breaths 3 s apart (20 a minute) written in minutes: 0.05 min apart, 19.95 "s" in all → about 1203 a minute;
    // exercise breathing reaches about 40–60 breaths/min (common practice)
    const asMinutes: BreathRow[] = Array.from({ length: 400 }, (_, i) => ({ timeS: i * 0.05, vo2MlMin: 1000 + i }));
    const m = checkPhysiologicalLimits(asMinutes);
    expect(m.map((i) => i.code)).toEqual(["short-recording"]);
    expect(m[0].message).toContain("400 breaths in 20 s would be about 1203 a minute: the time column is probably in minutes");
    // the same 400 breaths in seconds: no short recording and no such hint
    expect(checkPhysiologicalLimits(asMinutes.map((r) => ({ ...r, timeS: r.timeS * 60 })))).toEqual([]);
    // a short test breathed at 30 a minute is short, not mislabelled
    const slow = checkPhysiologicalLimits(Array.from({ length: 100 }, (_, i) => ({ timeS: i * 2, vo2MlMin: 1000 })));
    expect(slow[0].message).not.toContain("minutes, not seconds");
  });

  it("no rows: nothing to say", () => {
    expect(checkPhysiologicalLimits([])).toEqual([]);
  });
});

describe("at import: a 3-row file with VO2 8000 mL/min (invented)", () => {
  it("is read as 3 stages and carries both warnings, naming the column and the limit", async () => {
    // 8000 mL/min is inside the import's impossible-value range (≤ 8000), so it is kept, and flagged > 7000
    const csv = "time_s,vo2_ml_min,hr_bpm\n0,7900,120\n60,8000,140\n120,7950,160\n";
    const r = await importBreathFile(enc(csv));
    expect(r.table?.shape).toBe("stage");
    const limit = r.issues.find((i) => i.code === "beyond-physiological-limit");
    expect(limit?.severity).toBe("warning");
    expect(limit?.where?.column).toBe("vo2_ml_min");
    expect(limit?.message).toContain("3 value(s) above 7000 mL/min (highest 8000)");
    // 3 stages 60 s apart: 120 s + 60 s = 180 s = 3 min < 8 min
    const short = r.issues.find((i) => i.code === "short-recording");
    expect(short?.message).toContain("3 min (3 stage(s))");
  });

  it("the per-kg check uses the body mass given at import", async () => {
    // 12 min of breaths every 10 s; VO2 peaks at 4800 mL/min: 4800 / 50 kg = 96 mL/kg/min > 90; / 80 kg = 60
    const lines = ["time_s,vo2_ml_min,vco2_ml_min,ve_l_min"];
    for (let t = 0; t <= 720; t += 10) {
      const vo2 = 400 + (4400 * t) / 720;
      lines.push(`${t},${vo2.toFixed(0)},${(vo2 * 0.95).toFixed(0)},${(vo2 * 0.03).toFixed(1)}`);
    }
    const csv = lines.join("\n") + "\n";
    const light = await importBreathFile(enc(csv), { weightKg: 50 });
    expect(light.issues.filter((i) => i.code === "beyond-physiological-limit").map((i) => i.where?.field)).toEqual([
      "vo2MlKgMin",
    ]);
    const heavy = await importBreathFile(enc(csv), { weightKg: 80 });
    expect(heavy.issues.some((i) => i.code === "beyond-physiological-limit" || i.code === "short-recording")).toBe(false);
  });
});
