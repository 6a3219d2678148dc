// Reads the vitest and Playwright JSON reports and prints the plain closing line
// "tests: N passed, N failed, N skipped". Exits 1 on any failure, a missing report, or no test run.
import fs from "node:fs";

let passed = 0;
let failed = 0;
let skipped = 0;
let ok = true;
const args = process.argv.slice(2);
const checksAt = args.indexOf("--checks");
if (checksAt >= 0) {
  // Static checks (type check, lint, format) count as one test each.
  const file = args.splice(checksAt, 2)[1];
  for (const line of fs.existsSync(file) ? fs.readFileSync(file, "utf8").split("\n") : []) {
    if (line.endsWith(" passed")) passed += 1;
    else if (line.endsWith(" failed")) {
      failed += 1;
      console.log(`summary: static check ${line}`);
    }
  }
}
for (const file of args) {
  if (!fs.existsSync(file)) {
    console.log(`summary: ${file} is missing (that suite did not run to the end)`);
    ok = false;
    failed += 1;
    continue;
  }
  const r = JSON.parse(fs.readFileSync(file, "utf8"));
  if ("numPassedTests" in r) {
    passed += r.numPassedTests;
    // a failed test counts once; a file that failed with no failed test in it (it did not load) counts once more
    const brokenFiles = (r.testResults ?? []).filter(
      (f) => f.status === "failed" && !(f.assertionResults ?? []).some((a) => a.status === "failed"),
    ).length;
    failed += r.numFailedTests + brokenFiles;
    skipped += (r.numPendingTests ?? 0) + (r.numTodoTests ?? 0);
  } else if (r.stats) {
    passed += r.stats.expected + (r.stats.flaky ?? 0);
    failed += r.stats.unexpected;
    skipped += r.stats.skipped ?? 0;
  }
}
console.log(`tests: ${passed} passed, ${failed} failed, ${skipped} skipped`);
process.exit(ok && failed === 0 && passed > 0 ? 0 : 1);
