/**
 * Import + conditioning time for a 2 000-breath test written in several export layouts (INVENTED
 * SYNTHETIC DATA), per file and as a ratio to a bare split/Number parse of the same file.
 * Run: `npx tsx bench/import.bench.ts`. Prints a markdown table; asserts nothing.
 */
import os from "node:os";
import ExcelJS from "exceljs";
import { importBreathFile } from "../lib/breath";
import { conditionTable } from "../lib/signal";

interface Breath {
  t: number;
  vo2: number;
  vco2: number;
  ve: number;
  hr: number;
  w: number;
}

/** 2 000 breaths: 180 s rest, then a slow 10 W/min ramp; VO2 = 400 + 10·W plus a deterministic wobble. */
function breaths(): Breath[] {
  const out: Breath[] = [];
  let t = 0;
  for (let i = 0; i < 2000; i++) {
    const w = t < 180 ? 0 : (10 * (t - 180)) / 60;
    const vo2 = 400 + 10 * w + 25 * Math.sin(i * 1.7);
    const vco2 = vo2 * (0.85 + 0.2 * Math.min(1, w / 300));
    out.push({ t, vo2, vco2, ve: (vco2 * 28) / 1000, hr: 70 + 0.4 * w, w });
    t += 2 + (i % 3);
  }
  return out;
}

const mss = (t: number) => `${Math.floor(t / 60)}:${String(t % 60).padStart(2, "0")}`;

function layouts(b: Breath[]): Record<string, string> {
  const comma = (x: number, d: number) => x.toFixed(d).replace(".", ",");
  return {
    "plain convention CSV": [
      "time_s,vo2_ml_min,vco2_ml_min,ve_l_min,hr_bpm,work_w",
      ...b.map((x) => [x.t, x.vo2.toFixed(1), x.vco2.toFixed(1), x.ve.toFixed(2), x.hr.toFixed(0), x.w.toFixed(1)].join(",")),
    ].join("\n"),
    "semicolon, decimal comma, metadata, units row, m:ss": [
      "Name: invented",
      "Weight: 70 kg",
      "",
      "Zeit;V'O2;V'CO2;V'E;HF;Load",
      "m:ss;l/min;l/min;l/min;1/min;W",
      ...b.map((x) =>
        [mss(x.t), comma(x.vo2 / 1000, 4), comma(x.vco2 / 1000, 4), comma(x.ve, 2), x.hr.toFixed(0), comma(x.w, 1)].join(";"),
      ),
    ].join("\r\n"),
    "TSV, decimal minutes, units in brackets": [
      "t (min)\tVO2 (mL/min)\tVCO2 (mL/min)\tVE (L/min)\tHR (bpm)\tWR (W)",
      ...b.map((x) =>
        [(x.t / 60).toFixed(5), x.vo2.toFixed(1), x.vco2.toFixed(1), x.ve.toFixed(2), x.hr.toFixed(0), x.w.toFixed(1)].join("\t"),
      ),
    ].join("\n"),
    "quoted CSV, decimal comma, no units": [
      '"Time","VO2","VCO2","VE","HR","Power"',
      ...b.map((x) =>
        [mss(x.t), comma(x.vo2 / 1000, 4), comma(x.vco2 / 1000, 4), comma(x.ve, 2), x.hr.toFixed(0), comma(x.w, 1)]
          .map((c) => `"${c}"`)
          .join(","),
      ),
    ].join("\n"),
  };
}

/** Baseline: the least work that still reads the numbers — split lines and cells, Number() each cell. */
function bareParse(text: string): number {
  let sum = 0;
  const lines = text.split("\n");
  const sep = text.includes(";") ? ";" : text.includes("\t") ? "\t" : ",";
  for (let i = 1; i < lines.length; i++) {
    const cells = lines[i].split(sep);
    for (const c of cells) {
      const v = Number(c.replace(",", "."));
      if (v === v) sum += v;
    }
  }
  return sum;
}

async function median(runs: number, f: () => unknown | Promise<unknown>): Promise<number> {
  for (let i = 0; i < 3; i++) await f();
  const ms: number[] = [];
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    await f();
    ms.push(performance.now() - t0);
  }
  ms.sort((a, b) => a - b);
  return ms[Math.floor(ms.length / 2)];
}

async function main(): Promise<void> {
  const b = breaths();
  const runs = 15;
  const averaging = { kind: "rolling-time" as const, seconds: 30, label: "30-s rolling time window" };
  console.log(
    `Machine: ${os.cpus()[0]?.model ?? "unknown CPU"}, ${os.cpus().length} cores, Node ${process.version}; ${b.length} breaths; median of ${runs} runs; conditioning = artefact rule (4 SD, 5 breaths each side) + 30-s rolling average + phases\n`,
  );
  console.log("| layout | file KiB | bare parse (ms) | import (ms) | import + condition (ms) | ratio to bare parse | rows |");
  console.log("|---|---:|---:|---:|---:|---:|---:|");
  const plainText = layouts(b)["plain convention CSV"];
  for (const [name, text] of Object.entries(layouts(b))) {
    const bytes = new TextEncoder().encode(text);
    const bare = await median(runs, () => bareParse(text));
    let rows = 0;
    const imp = await median(runs, async () => {
      rows = (await importBreathFile(bytes)).table?.rows.length ?? 0;
    });
    const both = await median(runs, async () => {
      const r = await importBreathFile(bytes);
      if (r.table) conditionTable(r.table, { averaging });
    });
    console.log(
      `| ${name} | ${(bytes.length / 1024).toFixed(0)} | ${bare.toFixed(2)} | ${imp.toFixed(1)} | ${both.toFixed(1)} | ${(both / bare).toFixed(1)} | ${rows} |`,
    );
  }
  // xlsx: same numbers in a workbook; the baseline is the bare parse of the plain CSV
  const wb = new ExcelJS.Workbook();
  const ws = wb.addWorksheet("Data");
  ws.addRow(["Time (s)", "VO2 (L/min)", "VCO2 (L/min)", "VE (L/min)", "HR", "Watts"]);
  for (const x of b) ws.addRow([x.t, x.vo2 / 1000, x.vco2 / 1000, x.ve, Math.round(x.hr), x.w]);
  const xbytes = new Uint8Array(await wb.xlsx.writeBuffer());
  const bare = await median(runs, () => bareParse(plainText));
  let xrows = 0;
  const ximp = await median(5, async () => {
    xrows = (await importBreathFile(xbytes)).table?.rows.length ?? 0;
  });
  const xboth = await median(5, async () => {
    const r = await importBreathFile(xbytes);
    if (r.table) conditionTable(r.table, { averaging });
  });
  console.log(
    `| xlsx (exceljs; baseline = plain CSV bare parse) | ${(xbytes.length / 1024).toFixed(0)} | ${bare.toFixed(2)} | ${ximp.toFixed(1)} | ${xboth.toFixed(1)} | ${(xboth / bare).toFixed(1)} | ${xrows} |`,
  );
}

main();
