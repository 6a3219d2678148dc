/**
 * Spans of breaths a reviewer set aside are named in the report's methods with their reasons, apart from the count of
 * breaths the automatic screens set aside. Input: the INVENTED demo case "normal-adult" (synthetic preset, fixed seed).
 */
import { describe, expect, it } from "vitest";
import { analyse } from "../../lib/analysis";
import { buildReportModel } from "../../lib/report/buildReportModel";
import { demoLabel, demoRecord } from "./demoRecord";

describe("report methods with a span set aside by review", () => {
  it("names the span and its reason; every breath in it is gone from the analysis", async () => {
    const record = await demoRecord("normal-adult");
    const plain = analyse(record);
    const ex = plain.conditioned.exercise!;
    const span = { startS: ex.startS + 120, endS: ex.startS + 150, reason: "cough run, by Dr Invented" };
    const result = analyse(record, { conditioning: { setAside: [span] } });
    const inSpan = record.table.rows.filter((r) => r.timeS >= span.startS && r.timeS <= span.endS).length;
    expect(inSpan).toBeGreaterThan(5);
    expect(result.conditioned.clean.some((r) => r.timeS >= span.startS && r.timeS <= span.endS)).toBe(false);
    expect(result.conditioned.removed.filter((r) => r.reason.startsWith("set aside by review"))).toHaveLength(inSpan);
    const model = buildReportModel(result, record, demoLabel("normal-adult"), { status: "draft", sections: [] });
    const line = model.methods.find((m) => m.startsWith("Set aside by review before analysis:"));
    expect(line).toMatch(/^Set aside by review before analysis: \d+:\d\d–\d+:\d\d \(cough run, by Dr Invented\)\.$/);
    // the automatic count is what the screens removed, without the reviewer's breaths
    const automatic = result.conditioned.removed.length - inSpan;
    const autoLine = model.methods.find((m) => m.endsWith("breath values were set aside as artefacts before analysis."));
    expect(autoLine).toBe(automatic > 0 ? `${automatic} breath values were set aside as artefacts before analysis.` : undefined);
  });
});
