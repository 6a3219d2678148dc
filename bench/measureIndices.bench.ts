/**
 * Time of measureIndices (every index of a test: peaks, effort, VE/VCO2 slope, OUES, ΔVO2/ΔWR, O2 pulse, breathing
 * reserve, HR indices, SpO2, EOV, values at VT1/VT2, domains) on two tests of INVENTED SYNTHETIC DATA:
 * - one hour of breaths at 1 breath/s (3 600 breaths), the linear ramp of tests/thresholds/measureIndices.test.ts;
 * - a 2 000-breath synthetic test (as in the other benches), conditioned first (conditioning not timed).
 * Reported as median time per test and per 1 000 breaths, with the machine noted; asserts nothing.
 * Run: `npx tsx bench/measureIndices.bench.ts` or `npm run bench`.
 */
import os from "node:os";
import { conditionTable } from "../lib/signal";
import { generateSyntheticTest } from "../lib/synthetic";
import type { IndicesContext } from "../lib/thresholds/indexTypes";
import { measureIndices } from "../lib/thresholds/measureIndices";
import { oneHourRamp } from "../tests/thresholds/indicesFixture";

/** Median of `reps` timed calls after two warm-up calls, in ms. */
function median(reps: number, f: () => unknown): number {
  for (let i = 0; i < 2; i++) f();
  const runs: number[] = [];
  for (let i = 0; i < reps; i++) {
    const t0 = performance.now();
    f();
    runs.push(performance.now() - t0);
  }
  runs.sort((a, b) => a - b);
  return runs[Math.floor(runs.length / 2)];
}

/** The one-hour ramp of the index tests (tests/thresholds/indicesFixture.ts) with its thresholds. */
function oneHour() {
  const test = oneHourRamp();
  const ctx: IndicesContext = {
    patient: { ageY: 40, weightKg: 80 },
    vt1: { timeS: 1500, vo2MlMin: 1760 },
    vt2: { timeS: 2500, vo2MlMin: 2560 },
  };
  return { test, ctx, breaths: test.clean.length };
}

function synthetic2000() {
  const syn = generateSyntheticTest(
    { noise: "moderate", peakVo2MlMin: 4500, rampWPerMin: 7, weightKg: 90, restS: 300, recoveryS: 120 },
    1,
  );
  const rows = syn.table.rows.slice(0, 2000);
  if (rows.length < 2000) throw new Error(`bench test has only ${rows.length} breaths`);
  const test = conditionTable({ ...syn.table, rows });
  const at = (p: { timeS: number; vo2MlMin: number } | null) => (p ? { timeS: p.timeS, vo2MlMin: p.vo2MlMin } : null);
  const ctx: IndicesContext = {
    patient: { sex: "male", ageY: 40, heightCm: 180, weightKg: 90 },
    spirometry: { fev1L: 4 },
    vt1: at(syn.truth.vt1),
    vt2: at(syn.truth.vt2),
  };
  return { test, ctx, breaths: rows.length };
}

function main(): void {
  console.log(`Machine: ${os.cpus()[0]?.model ?? "unknown"} × ${os.cpus().length}, Node ${process.version}; median of runs\n`);
  console.log("| test | breaths | time per test | time per 1 000 breaths |\n| --- | --- | --- | --- |");
  for (const [label, make] of [
    ["one hour at 1 breath/s, linear ramp", oneHour],
    ["synthetic test, moderate noise, conditioned", synthetic2000],
  ] as const) {
    const { test, ctx, breaths } = make();
    const ms = median(30, () => measureIndices(test, ctx));
    console.log(`| ${label} | ${breaths} | ${ms.toFixed(1)} ms | ${((1000 * ms) / breaths).toFixed(2)} ms |`);
  }
}

main();
