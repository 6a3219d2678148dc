/**
 * `npm run bench`: runs every bench/*.bench.ts in turn (each prints its own table with the machine
 * noted). Figures are per-item times and ratios; nothing here asserts a timing.
 */
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";

const dir = path.dirname(new URL(import.meta.url).pathname);
const files = fs
  .readdirSync(dir)
  .filter((f) => f.endsWith(".bench.ts"))
  .sort();
console.log(
  `# cpet-desk benchmarks\n\nMachine: ${os.cpus()[0]?.model ?? "unknown CPU"}, ${os.cpus().length} cores, Node ${process.version}, ${os.platform()} ${os.arch()}\n`,
);
let failed = 0;
for (const f of files) {
  console.log(`## ${f}\n`);
  const r = spawnSync(process.execPath, ["--import", "tsx", path.join(dir, f)], { stdio: "inherit" });
  if (r.status !== 0) failed += 1;
  console.log("");
}
process.exit(failed > 0 ? 1 : 0);
