/**
 * Time of the synthetic test generators (INVENTED SYNTHETIC DATA, truth known by construction) that the threshold banks
 * draw on: median time per 1 000 generated breaths over 12 tests per model at moderate noise, after a warm-up. The
 * banks run hundreds of tests per screen, so this says how much of a screen is generation. Asserts nothing.
 * Run: `npx tsx bench/synthetic.bench.ts` or `npm run bench`.
 */
import os from "node:os";
import {
  generateAuditTest,
  generateCrossCheckTest,
  generateHoldoutTest,
  generateSecondOpinionTest,
  generateVariantTest,
  generateSyntheticTest,
  auditSpec,
  crossCheckSpec,
  holdoutSpec,
  secondOpinionSpec,
  syntheticBank,
  variantSpec,
} from "../lib/synthetic";

type Make = (i: number) => { table: { rows: unknown[] } };
const MAIN_CASES = syntheticBank(12, { seed: 5, noiseLevels: ["moderate"] });

const MODELS: [string, Make][] = [
  [
    "main",
    (i) => {
      const c = MAIN_CASES[i];
      return generateSyntheticTest(c.spec, c.seed);
    },
  ],
  ["variant", (i) => generateVariantTest(variantSpec(i, 5, ["moderate"]), 5000 + i)],
  ["hold-out", (i) => generateHoldoutTest(holdoutSpec(i, 5, ["moderate"]), 5 + i)],
  ["audit", (i) => generateAuditTest(auditSpec(i, 5, ["moderate"]), 5 + i)],
  ["cross-check", (i) => generateCrossCheckTest(crossCheckSpec(i, 5, ["moderate"]), 5 + i)],
  ["second-opinion", (i) => generateSecondOpinionTest(secondOpinionSpec(i, 5, ["moderate"]), 5 + i)],
];

function main(): void {
  console.log(
    `Machine: ${os.cpus()[0]?.model ?? "unknown"} × ${os.cpus().length}, Node ${process.version}; median of 12 tests\n`,
  );
  console.log("| model | breaths per test (median) | time per 1 000 breaths |\n| --- | --- | --- |");
  for (const [name, make] of MODELS) {
    make(0); // warm-up
    const perBreath: number[] = [];
    const breaths: number[] = [];
    for (let i = 0; i < 12; i++) {
      const t0 = performance.now();
      const t = make(i);
      perBreath.push((performance.now() - t0) / t.table.rows.length);
      breaths.push(t.table.rows.length);
    }
    perBreath.sort((a, b) => a - b);
    breaths.sort((a, b) => a - b);
    console.log(`| ${name} | ${breaths[6]} | ${(1000 * perBreath[6]).toFixed(2)} ms |`);
  }
}

main();
