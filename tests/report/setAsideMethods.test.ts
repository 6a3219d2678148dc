/**
 * Spans of breaths a reviewer set aside are named in the report's methods with their reasons, apart from the count of
 * breaths the automatic screens set aside. Input: the INVENTED demo case "normal-adult" (synthetic preset, fixed seed).
 */
import { describe, expect, it } from "vitest";
import { analyse } from "../../lib/analysis";
import { buildReportModel } from "../../lib/report/buildReportModel";
import { demoLabel, demoRecord } from "./demoRecord";

describe("report methods with a span set aside by review", () => {
  it("names the span and its reason; the gas values of every breath in it are gone from the analysis", async () => {
    const record = await demoRecord("normal-adult");
    const plain = analyse(record);
    const ex = plain.conditioned.exercise!;
    const span = { startS: ex.startS + 120, endS: ex.startS + 150, reason: "cough run, by Dr Invented" };
    const result = analyse(record, { conditioning: { setAside: [span] } });
    const inSpan = record.table.rows.filter((r) => r.timeS >= span.startS && r.timeS <= span.endS).length;
    expect(inSpan).toBeGreaterThan(5);
    // the rows stay (heart rate and load are kept); their gas values are gone
    const kept = result.conditioned.clean.filter((r) => r.timeS >= span.startS && r.timeS <= span.endS);
    expect(kept).toHaveLength(inSpan);
    expect(kept.every((r) => r.vo2MlMin === undefined && r.hrBpm !== undefined)).toBe(true);
    expect(result.conditioned.removed.filter((r) => r.reason.startsWith("set aside by review"))).toHaveLength(inSpan);
    const model = buildReportModel(result, record, demoLabel("normal-adult"), { status: "draft", sections: [] });
    const line = model.methods.find((m) => m.startsWith("Set aside by review before analysis:"));
    expect(line).toMatch(
      /^Set aside by review before analysis: gas and ventilation values, \d+:\d\d–\d+:\d\d \(cough run, by Dr Invented\)\.$/,
    );
    // the automatic count is what the screens removed, without the reviewer's breaths
    const automatic = result.conditioned.removed.length - inSpan;
    const autoLine = model.methods.find((m) => m.endsWith("breath values were set aside as artefacts before analysis."));
    expect(autoLine).toBe(automatic > 0 ? `${automatic} breath values were set aside as artefacts before analysis.` : undefined);
  });

  it("a reviewer's word that VO2 was checked is a fixed line of the methods", async () => {
    const record = await demoRecord("normal-adult");
    // INVENTED leak: every gas volume × 0.4, so ΔVO2/ΔWR falls below 4.8 mL/min/W by construction
    const rows = record.table.rows.map((r) => ({
      ...r,
      ...(r.vo2MlMin !== undefined ? { vo2MlMin: r.vo2MlMin * 0.4 } : {}),
      ...(r.vco2MlMin !== undefined ? { vco2MlMin: r.vco2MlMin * 0.4 } : {}),
      ...(r.veLMin !== undefined ? { veLMin: r.veLMin * 0.4 } : {}),
    }));
    const leak = { ...record, table: { ...record.table, rows } };
    const doubted = buildReportModel(analyse(leak), leak, "x", { status: "draft", sections: [] });
    expect(doubted.methods.some((m) => m.startsWith("VO2-based values were read at a reviewer's word"))).toBe(false);
    const result = analyse(leak, { vo2Checked: { reason: "checked gas calibration, by Dr Invented" } });
    const model = buildReportModel(result, leak, "x", { status: "draft", sections: [] });
    // the key-value rows computed from VO2 say it where the reader looks first
    const peakRow = model.keyValues.find((r) => r.label.startsWith("Peak VO2"))!;
    expect(peakRow.note).toContain("read at a reviewer's word, see methods");
    expect(model.methods).toContain(
      `VO2-based values were read at a reviewer's word, although ΔVO2/ΔWR was ${result.indices.dVo2dWr.whole.slope.value!.toFixed(1)} mL/min/W, below 4.8: checked gas calibration, by Dr Invented.`,
    );
  });
});
