/**
 * Writes the six INVENTED end-to-end cases to tests/fixtures/cases/: one breath file per case
 * (plain column convention, made by the synthetic generator from its preset and a fixed seed) and
 * one JSON file with the invented patient details. Run: npx tsx scripts/make-case-fixtures.ts
 * The files are committed so the end-to-end test does not change when the generator changes.
 */
import fs from "node:fs";
import path from "node:path";
import { DEMO_CASES, demoCsv } from "../lib/store/demoCases";

const dir = path.join(process.cwd(), "tests", "fixtures", "cases");
fs.mkdirSync(dir, { recursive: true });
for (const d of DEMO_CASES) {
  const header = `# INVENTED synthetic exercise test (not patient data): preset ${d.presetId}, seed ${d.seed}, made by lib/synthetic\n`;
  fs.writeFileSync(path.join(dir, `${d.presetId}.csv`), header + demoCsv(d));
  const { patient, ergometer, referral, spirometry, conduct, context, label } = d;
  fs.writeFileSync(
    path.join(dir, `${d.presetId}.json`),
    JSON.stringify({ invented: true, label, patient, ergometer, referral, spirometry, conduct, context }, null, 2) + "\n",
  );
}
console.log(`wrote ${DEMO_CASES.length} cases to ${path.relative(process.cwd(), dir)}`);
