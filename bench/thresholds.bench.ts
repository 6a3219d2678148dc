/**
 * Timing of ventilatory-threshold detection on a 2 000-breath synthetic test (invented data) against
 * parsing the same test's CSV. Run: `npx tsx bench/thresholds.bench.ts`.
 */
import os from "node:os";
import { importBreathFile } from "../lib/breath";
import { conditionTable } from "../lib/signal";
import { breathTableToCsv, generateSyntheticTest } from "../lib/synthetic";
import { detectThresholds } from "../lib/thresholds/detectThresholds";
import { veVco2Slope } from "../lib/thresholds/veVco2Slope";

async function main(): Promise<void> {
  // a long, slow ramp so the record holds at least 2 000 breaths; then cut to exactly 2 000
  const syn = generateSyntheticTest(
    { noise: "moderate", peakVo2MlMin: 4500, rampWPerMin: 7, weightKg: 90, restS: 300, recoveryS: 120 },
    1,
  );
  const rows = syn.table.rows.slice(0, 2000);
  if (rows.length < 2000) throw new Error(`bench test has only ${rows.length} breaths`);
  const table = { ...syn.table, rows };
  const bytes = new TextEncoder().encode(breathTableToCsv(table));
  const time = async (label: string, reps: number, f: () => unknown | Promise<unknown>) => {
    for (let i = 0; i < 3; i++) await f();
    const t0 = performance.now();
    for (let i = 0; i < reps; i++) await f();
    const ms = (performance.now() - t0) / reps;
    console.log(`${label.padEnd(48)} ${ms.toFixed(2).padStart(8)} ms`);
    return ms;
  };
  console.log(
    `machine: ${os.cpus()[0]?.model ?? "unknown"} × ${os.cpus().length}, node ${process.version}; ${rows.length} breaths, ${(bytes.length / 1024).toFixed(0)} KiB CSV`,
  );
  const parse = await time("parse CSV (importBreathFile)", 20, () => importBreathFile(bytes));
  const test = conditionTable(table);
  const detect0 = await time("detectThresholds, no resampling", 50, () => detectThresholds(test, { bootstrap: 0 }));
  const detect20 = await time("detectThresholds, 20 block-bootstrap resamples", 10, () =>
    detectThresholds(test, { bootstrap: 20 }),
  );
  const detect30 = await time("detectThresholds, 30 block-bootstrap resamples", 10, () =>
    detectThresholds(test, { bootstrap: 30 }),
  );
  const detect50 = await time("detectThresholds, 50 block-bootstrap resamples", 10, () =>
    detectThresholds(test, { bootstrap: 50 }),
  );
  const r20 = detectThresholds(test, { bootstrap: 20 });
  const vt2 = r20.vt2.timeS !== null ? { timeS: r20.vt2.timeS, vo2MlMin: r20.vt2.vo2MlMin.value ?? 0 } : null;
  const slope = await time("veVco2Slope (corner-refined slope to VT2)", 50, () => veVco2Slope(test, { vt2 }));
  console.log(`ratio veVco2Slope/parse: ${(slope / parse).toFixed(2)}×`);
  console.log(`20 resamples alone (detect20 − detect0)/parse: ${((detect20 - detect0) / parse).toFixed(2)}×`);
  console.log(
    `ratio detect/parse: no resampling ${(detect0 / parse).toFixed(2)}×, 20 resamples (engine default call) ${(detect20 / parse).toFixed(2)}×, 30 resamples ${(detect30 / parse).toFixed(2)}×, 50 resamples ${(detect50 / parse).toFixed(2)}×`,
  );
}

void main();
