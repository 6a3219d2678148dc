import { readFileSync } from "node:fs";
import ExcelJS from "exceljs";
import { describe, expect, it } from "vitest";
import { importBreathFile } from "../../lib/breath";
import { conditionTable } from "../../lib/signal";
import { peakOverWindow } from "../../lib/thresholds/peak";
import { SYNTHETIC_WEIGHT_KG, syntheticSeries } from "../fixtures/layouts/syntheticSeries";

// INVENTED SYNTHETIC DATA: every layout below was written from syntheticSeries() (see
// tests/fixtures/layouts/writeLayouts.ts), so all must import to the same peak VO2.
const read = (name: string) => new Uint8Array(readFileSync(new URL(`../fixtures/layouts/${name}`, import.meta.url)));
const series = syntheticSeries();
// Peak window of 30.5 s: breath times are whole seconds, so no breath sits exactly on a window edge and
// the rounding of times in some layouts (decimal minutes) cannot change which breaths are averaged.
const WINDOW_S = 30.5;
const truePeak = peakOverWindow(series, "vo2MlMin", { windowS: WINDOW_S, unit: "mL/min" }).value!;

const LAYOUTS: { file: string; kind: string; decimalMark: "." | ","; timeFormat: string; weightKg?: number }[] = [
  { file: "plain_convention.csv", kind: "csv", decimalMark: ".", timeFormat: "seconds" },
  { file: "semicolon_decimal_comma_units_row.csv", kind: "semicolon", decimalMark: ",", timeFormat: "m:ss" },
  { file: "tab_minutes_brackets_kpa.tsv", kind: "tsv", decimalMark: ".", timeFormat: "minutes" },
  { file: "quoted_decimal_comma_clock.csv", kind: "csv", decimalMark: ",", timeFormat: "clock-of-day" },
  { file: "aligned_units_row_per_kg.txt", kind: "whitespace", decimalMark: ".", timeFormat: "seconds" },
];

async function xlsxLayout(): Promise<Uint8Array> {
  // sixth layout, built here: metadata rows, durations as spreadsheet times, VO2 per kg (needs weight)
  const wb = new ExcelJS.Workbook();
  wb.addWorksheet("Notes").addRow(["invented synthetic test"]);
  const ws = wb.addWorksheet("Breaths");
  ws.addRow(["Subject: invented"]);
  ws.addRow([]);
  ws.addRow(["Time (hh:mm:ss)", "VO2 (mL/kg/min)", "VCO2 (L/min)", "VE (L/min)", "Watts", "PETCO2 (mmHg)"]);
  for (const b of series) {
    const row = ws.addRow([
      b.timeS / 86400,
      b.vo2MlMin / SYNTHETIC_WEIGHT_KG,
      b.vco2MlMin / 1000,
      b.veLMin,
      b.workW,
      b.petco2MmHg,
    ]);
    row.getCell(1).numFmt = "hh:mm:ss";
  }
  return new Uint8Array(await wb.xlsx.writeBuffer());
}

describe("export layouts of one synthetic series (invented data)", () => {
  it("the true peak is known from the series itself", () => {
    // VO2 follows work with a 30-s lag, so the best 30-s window is 840–870 s, where the lagged work runs
    // 207.5 → 220 W (mean ≈ 213.75 W): 350 + 10·213.75 = 2487.5 mL/min, ± the wobble (|wobble| ≤ 23)
    expect(truePeak).toBeGreaterThan(2487.5 - 23);
    expect(truePeak).toBeLessThan(2487.5 + 23);
  });

  for (const layout of LAYOUTS) {
    it(`${layout.file}: format detected and same peak VO2`, async () => {
      const r = await importBreathFile(read(layout.file));
      expect(r.issues.filter((i) => i.severity !== "info")).toEqual([]);
      expect(r.table).not.toBeNull();
      expect(r.format?.kind).toBe(layout.kind);
      expect(r.format?.decimalMark).toBe(layout.decimalMark);
      expect(r.format?.timeFormat).toBe(layout.timeFormat);
      expect(r.table!.rows.length).toBe(series.length);
      const peak = peakOverWindow(r.table!.rows, "vo2MlMin", { windowS: WINDOW_S, unit: "mL/min" }).value!;
      // rounding in the layouts (4 decimals of L/min = 0.05 mL/min; 5 decimals of mL/kg/min × 72 kg) stays below 1 mL/min
      expect(Math.abs(peak - truePeak)).toBeLessThan(1);
      // VCO2 and VE carried as well
      const last = r.table!.rows.find((x) => x.timeS === 837)!;
      expect(last.vco2MlMin).toBeCloseTo(series.find((b) => b.timeS === 837)!.vco2MlMin, 0);
      expect(last.veLMin).toBeCloseTo(series.find((b) => b.timeS === 837)!.veLMin, 1);
    });
  }

  it("semicolon layout: metadata lines, units row, body mass read from the details", async () => {
    const r = await importBreathFile(read("semicolon_decimal_comma_units_row.csv"));
    expect(r.format?.metadataLines).toBe(4);
    expect(r.format?.headerRow).toBe(6);
    expect(r.format?.unitsRow).toBe(7);
    expect(r.format?.metadata.Weight).toBe("72 kg");
    const vo2 = r.columns.find((c) => c.header === "V'O2")!;
    expect(vo2.field).toBe("vo2MlMin");
    expect(vo2.unit).toBe("L/min");
    expect(vo2.factor).toBe(1000);
    expect(vo2.reason).toMatch(/units row/);
  });

  it("tab layout: PETCO2 in kPa converted to mmHg (1 kPa = 7.50062 mmHg)", async () => {
    const r = await importBreathFile(read("tab_minutes_brackets_kpa.tsv"));
    const first = r.table!.rows[0];
    // 38.0 mmHg was written as 38/7.50062 = 5.066 kPa → 5.066·7.50062 = 37.998 mmHg
    expect(first.petco2MmHg).toBeCloseTo(38, 1);
    expect(r.columns.find((c) => c.field === "petco2MmHg")?.unit).toBe("kPa");
  });

  it("quoted layout: event rows become markers and phases", async () => {
    const r = await importBreathFile(read("quoted_decimal_comma_clock.csv"));
    expect(r.events.map((e) => [e.label, e.phase, e.timeS])).toEqual([
      ["Warm-up start", "warmup", 180],
      ["Exercise start", "exercise", 360],
      ["Recovery", "recovery", 840],
    ]);
    const c = conditionTable(r.table!);
    expect(c.exercise).toEqual({ startS: 361, endS: 837 }); // first and last breath after/before the markers
    expect(r.issues.some((i) => i.code === "time-made-relative")).toBe(true);
  });

  it("aligned layout: VO2 per kg converted with the body mass found in the details", async () => {
    const r = await importBreathFile(read("aligned_units_row_per_kg.txt"));
    expect(r.weight).toEqual({ kg: 72, from: "metadata" });
    expect(r.issues.map((i) => i.code)).toContain("per-kg-converted");
    expect(r.columns.find((c) => c.header === "Vt")?.unit).toBe("mL");
  });

  it("xlsx layout (built with exceljs): picks the data sheet, reads durations, converts per kg with the given weight", async () => {
    const bytes = await xlsxLayout();
    const r = await importBreathFile(bytes, { weightKg: SYNTHETIC_WEIGHT_KG });
    expect(r.format?.kind).toBe("xlsx");
    expect(r.format?.sheet).toBe("Breaths");
    expect(r.table!.rows.length).toBe(series.length);
    expect(r.table!.rows[5].timeS).toBeCloseTo(series[5].timeS, 6);
    const peak = peakOverWindow(r.table!.rows, "vo2MlMin", { windowS: WINDOW_S, unit: "mL/min" }).value!;
    expect(Math.abs(peak - truePeak)).toBeLessThan(1);
    // without a weight: per-kg values are kept and the user is asked for the weight
    const noWeight = await importBreathFile(bytes);
    expect(noWeight.issues.find((i) => i.code === "weight-needed")?.severity).toBe("warning");
    expect(noWeight.table!.vo2PerKg).toBe(true);
    expect(noWeight.table!.rows[0].vo2MlMin).toBeUndefined();
    expect(noWeight.table!.rows[0].vo2MlKgMin).toBeCloseTo(series[0].vo2MlMin / SYNTHETIC_WEIGHT_KG, 6);
  });

  it("a mapping overrides the automatic decision and says so", async () => {
    const r = await importBreathFile(read("semicolon_decimal_comma_units_row.csv"), {
      mapping: { HF: { field: null }, BF: { field: "rrBrMin", unit: "1/min" } },
    });
    const hf = r.columns.find((c) => c.header === "HF")!;
    expect(hf.field).toBeNull();
    expect(hf.reason).toMatch(/set by user/);
    expect(r.table!.fields).not.toContain("hrBpm");
    expect(r.columns.find((c) => c.header === "BF")!.reason).toMatch(/set by user/);
  });
});

describe("a heart-rate column headed 'Puls' (German and Nordic exports)", () => {
  it("is read as heart rate in beats per minute (invented rows)", async () => {
    const csv = [
      "Zeit,VO2,VCO2,VE,Puls",
      ...Array.from({ length: 40 }, (_, i) => `${i * 3},${800 + 10 * i},${720 + 11 * i},${20 + i * 0.3},${80 + i}`),
    ].join("\n");
    const r = await importBreathFile(new TextEncoder().encode(csv), { fileName: "puls.csv" });
    expect(r.columns.find((c) => c.header === "Puls")?.field).toBe("hrBpm");
    expect(r.table?.rows[5].hrBpm).toBe(85);
  });
});
