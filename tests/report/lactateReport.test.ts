import { execFileSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { analyse, type TestRecord } from "../../lib/analysis";
import { buildReportModel } from "../../lib/report/buildReportModel";
import { CLINICAL_CAUTION } from "../../lib/report/caution";
import { initialDraftSections } from "../../lib/report/initialDraftSections";
import { renderReportPdf } from "../../lib/report/pdf/renderReportPdf";
import { renderChartSvg } from "../../lib/report/charts/renderChartSvg";
import { demoLabel, demoRecord } from "./demoRecord";

// The INVENTED demo case "normal-adult" (synthetic preset, fixed seed) with INVENTED lactate samples whose thresholds are
// known by construction: 0 W 1.0, 50 W 1.1, 100 W 1.5, 150 W 3.0, 200 W 5.0 mmol/L, and a routine peak-lactate draw
// 3 min into recovery (8.5 mmol/L, no work rate).
// OBLA 4 mmol/L (Sjödin & Jacobs 1981, confirmed): 150 + (4 − 3)/(5 − 3) · 50 = 175 W.
// The 0-W sample is a resting one: shown, but off the exercise curve the methods read (CLIN7 M3). Baseline + 1 mmol/L
// (Bishop et al. 1998, confirmed; baseline = the lowest exercise value, 1.1 at 50 W, our choice): 2.1 mmol/L between
// 100 W (1.5) and 150 W (3.0): 100 + 0.6/1.5 · 50 = 120 W.
async function lactateCase(): Promise<{ record: TestRecord; result: ReturnType<typeof analyse> }> {
  const record = await demoRecord("normal-adult");
  const endS = analyse(record).conditioned.exercise!.endS;
  record.lactate = [
    { workW: 0, lactateMmolL: 1.0 },
    { workW: 50, lactateMmolL: 1.1 },
    { workW: 100, lactateMmolL: 1.5 },
    { workW: 150, lactateMmolL: 3.0 },
    { workW: 200, lactateMmolL: 5.0 },
    { timeS: endS + 180, lactateMmolL: 8.5 },
  ];
  return { record, result: analyse(record) };
}

function pdfText(pdf: Buffer): string {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "cpet-lactate-"));
  const file = path.join(dir, "r.pdf");
  fs.writeFileSync(file, pdf);
  try {
    // -raw: text in drawing order, so the rotated DRAFT watermark's letters cannot land inside a table row
    return execFileSync("pdftotext", ["-raw", file, "-"])
      .toString()
      .replace(/\u00a0/g, " ")
      .replace(/\s+/g, " ");
  } catch {
    throw new Error("pdftotext not found: install poppler-utils (e.g. apt-get install poppler-utils) to run the PDF text checks");
  } finally {
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

describe("lactate thresholds in the report (table, draft text, chart, PDF)", () => {
  it("the thresholds table names each method as the page does, with value, lactate level and relation to VT1/VT2", async () => {
    const { record, result } = await lactateCase();
    const model = buildReportModel(result, record, demoLabel("normal-adult"), {
      status: "draft",
      sections: initialDraftSections(result),
    });
    const row = (label: string) => model.thresholds.find((r) => r.label === label)!;
    expect(row("OBLA (4 mmol/L)")).toMatchObject({ value: "175", unit: "W" });
    expect(row("OBLA (4 mmol/L)").method).toBe("OBLA (4 mmol/L): intensity at 4 mmol/L (linear interpolation)");
    expect(row("OBLA (4 mmol/L)").note).toMatch(
      /^lactate 4\.0 mmol\/L; heart rate \d+ bpm; VO2 \d+ mL\/min; \d+ W \(\d+\.\d%\) (above|below) VT2 \(\d+ W\): /,
    );
    // samples 50 W apart (wider than 20 W, our choice): within 25 W of its VT a threshold cannot be told apart from it
    expect(row("OBLA (4 mmol/L)").note).toMatch(/VT2 \(194 W\): cannot be told apart at this sampling \(within 25 W\)$/);
    expect(row("Baseline + 1 mmol/L")).toMatchObject({ value: "120", unit: "W" });
    // Dmax (paired with VT2) lies far below VT2 and near VT1: a discordance, never "concordant" with VT1
    expect(row("Dmax").note).toMatch(/below VT2 \(194 W\), near VT1 \(115 W\): check both/);
    expect(row("OBLA (4 mmol/L)").sourceIds).toContain("sjodin-jacobs-1981");
    // the recovery draw is peak lactate only
    expect(row("Peak lactate")).toMatchObject({ value: "8.5", unit: "mmol/L" });
    expect(row("Peak lactate").note).toMatch(/1 sample drawn in recovery included here; not on the lactate curve/);
    expect(
      model.methods.some((m) =>
        /^Lactate thresholds from 5 points of blood lactate against work rate \(1 at rest, not on the exercise curve/.test(m),
      ),
    ).toBe(true);
  });

  it("the draft text carries the thresholds in words", async () => {
    const { result } = await lactateCase();
    const text = initialDraftSections(result)
      .find((s) => s.id === "thresholds")!
      .paragraphs.join("\n");
    expect(text).toMatch(
      /Blood lactate thresholds from 5 points \(1 at rest, shown but not on the exercise curve the methods read\) against work rate; peak lactate 8\.5 mmol\/L\./,
    );
    expect(text).toMatch(/1 sample drawn in recovery counts towards peak lactate only and is not on the curve\./);
    expect(text).toMatch(
      /OBLA \(4 mmol\/L\) at 175 W \(lactate 4\.0 mmol\/L, heart rate \d+ bpm, VO2 \d+ mL\/min\), \d+ W \(\d+\.\d%\) below VT2/,
    );
    expect(text).toMatch(/Baseline \+ 1 mmol\/L at 120 W \(lactate 2\.1 mmol\/L, heart rate \d+ bpm/);
    // heart rate rises with the threshold's work rate: Baseline + 1 (120 W) < OBLA (175 W); INVENTED case, HR rises on the ramp
    const hr = (name: string) => Number(new RegExp(`${name} at \\d+ W \\([^)]*heart rate (\\d+) bpm`).exec(text)![1]);
    expect(hr("Baseline \\+ 1 mmol/L")).toBeLessThan(hr("OBLA \\(4 mmol/L\\)"));
  });

  it("a method read across a suspect sample carries its caution in the table and the draft (INVENTED spike)", async () => {
    // INVENTED samples: 50 W 1.0, 100 W 4.8 (a spike: 3.8 above 1.0 and 3.3 above 1.5, more than max(1.0, 1.2)),
    // 150 W 1.5, 200 W 5.0. OBLA from the lowest point: 50 + (4 − 1.0)/(4.8 − 1.0) · 50 = 89.5 W, read across the spike
    const record = await demoRecord("normal-adult");
    record.lactate = [50, 100, 150, 200].map((workW, i) => ({ workW, lactateMmolL: [1.0, 4.8, 1.5, 5.0][i] }));
    const result = analyse(record);
    expect(result.indices.lactate!.thresholds.find((t) => t.id === "obla-4")!.intensity.value).toBeCloseTo(89.47, 2);
    const model = buildReportModel(result, record, "x", { status: "draft", sections: initialDraftSections(result) });
    const row = model.thresholds.find((r) => r.label === "OBLA (4 mmol/L)")!;
    expect(row.note).toMatch(/caution: read across the spike of 4\.8 mmol\/L at 100 W: may be wrong/);
    // OBLA 89 W lies below VT1 (115 W): implausible, said so
    expect(row.note).toMatch(/below VT1, physiologically implausible/);
    const text = initialDraftSections(result)
      .find((s) => s.id === "thresholds")!
      .paragraphs.join("\n");
    expect(text).toMatch(/OBLA \(4 mmol\/L\) at 89 W [^\n]*Caution: read across the spike of 4\.8 mmol\/L at 100 W/);
  });

  it("the chart names the methods in its legend, draws VT1/VT2 and keeps the recovery draw off the curve", async () => {
    const { result, record } = await lactateCase();
    const model = buildReportModel(result, record, "x", { status: "draft", sections: [] });
    const spec = model.charts.find((c) => c.id === "lactate")!;
    const names = spec.series.map((s) => s.name);
    expect(names).toContain("OBLA (4 mmol/L) 175 W");
    expect(names).toContain("Baseline + 1 mmol/L 120 W");
    expect(spec.markers.map((m) => m.label).sort()).toEqual(["VT1", "VT2"]);
    expect(spec.series[0].points[0]).toEqual([0, 1.0]);
    expect(spec.note).toBe("1 recovery sample (peak lactate 8.5 mmol/L) not on the curve");
    const svg = renderChartSvg(spec);
    for (const id of ["obla-4", "baseline-plus-1", "modified-dmax", "log-log"]) expect(svg).not.toContain(`>${id}<`);
  });

  it("the PDF shows the lactate thresholds by name, with the draft mark and the clinical caution", async () => {
    const { record, result } = await lactateCase();
    const model = buildReportModel(result, record, demoLabel("normal-adult"), {
      status: "draft",
      sections: initialDraftSections(result),
    });
    const text = pdfText(await renderReportPdf(model));
    expect(text).toMatch(/OBLA \(4 mmol\/L\) 175 W/);
    expect(text).toMatch(/Baseline \+ 1 mmol\/L 120 W/);
    expect(text).toMatch(/Peak lactate 8\.5 mmol\/L/);
    expect(text).toMatch(/OBLA \(4 mmol\/L\) at 175 W \(lactate 4\.0 mmol\/L, heart rate \d+ bpm/);
    expect(text).toContain("DRAFT - not signed");
    expect(text).toContain(CLINICAL_CAUTION);
    expect(text).not.toMatch(/obla-4|modified-dmax|baseline-plus-1/);
  });
});
