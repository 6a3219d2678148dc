// `npm start`: build when the build is missing or older than the sources, then serve on
// http://localhost:3000 (PORT overrides). The embedded SQLite database is created under data/ on
// first request and the invented demo cases are seeded when it is empty.
import { execFileSync, spawn } from "node:child_process";
import fs from "node:fs";
import path from "node:path";

const root = path.resolve(path.dirname(new URL(import.meta.url).pathname), "..");
process.chdir(root);
process.env.NEXT_TELEMETRY_DISABLED = "1";
const nextBin = path.join(root, "node_modules", "next", "dist", "bin", "next");

function newestMtime(dir) {
  let newest = 0;
  if (!fs.existsSync(dir)) return 0;
  for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
    const p = path.join(dir, entry.name);
    newest = Math.max(newest, entry.isDirectory() ? newestMtime(p) : fs.statSync(p).mtimeMs);
  }
  return newest;
}

const buildId = path.join(root, ".next", "BUILD_ID");
const built = fs.existsSync(buildId) ? fs.statSync(buildId).mtimeMs : 0;
const sources = Math.max(
  ...["app", "lib", "reference-equations", "public"].map((d) => newestMtime(path.join(root, d))),
  fs.statSync("package.json").mtimeMs,
);
if (built < sources) {
  console.log("cpet-desk: building the app (first start or sources changed)…");
  execFileSync(process.execPath, [nextBin, "build"], { stdio: "inherit" });
}
const port = process.env.PORT ?? "3000";
// The app has no log-in: it listens on this machine only unless HOST says otherwise.
const host = process.env.HOST ?? "127.0.0.1";
console.log(`cpet-desk: serving http://localhost:${port} (database: ${process.env.CPET_DB ?? "data/cpet-desk.sqlite"})`);
const child = spawn(process.execPath, [nextBin, "start", "-p", port, "-H", host], { stdio: "inherit" });
for (const sig of ["SIGINT", "SIGTERM"]) process.on(sig, () => child.kill(sig));
child.on("exit", (code) => process.exit(code ?? 0));
