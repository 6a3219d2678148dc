import { execFileSync, spawnSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { plainRampCsv } from "../../e2e/fixtures/plain-ramp.csv";

const bin = path.resolve(__dirname, "../../bin/cpet.mjs");
const tmp = fs.mkdtempSync(path.join(os.tmpdir(), "cpet-cli-"));

function run(args: string[]) {
  return spawnSync(process.execPath, [bin, ...args], { encoding: "utf8", timeout: 60_000 });
}

describe("cpet analyse (command line)", () => {
  it("prints one JSON object with peak.vo2MlMin and nothing else on stdout", () => {
    const file = path.join(tmp, "ramp.csv");
    fs.writeFileSync(file, plainRampCsv());
    const out = execFileSync(process.execPath, [bin, "analyse", file, "--json", "--weight-kg", "80"], { encoding: "utf8" });
    const json = JSON.parse(out);
    // Known by construction (e2e/fixtures/plain-ramp.csv.ts): highest 30-s average is 2500 mL/min.
    expect(json.peak.vo2MlMin).toBeCloseTo(2500, 6);
    expect(json.peak.vo2MlKgMin).toBeCloseTo(31.25, 6);
    expect(Array.isArray(json.issues)).toBe(true);
  });

  it("refuses a file it cannot use with a plain message on stderr, no stack trace, non-zero exit", () => {
    const file = path.join(tmp, "bad.csv");
    fs.writeFileSync(file, "a,b\n1,2\n");
    const r = run(["analyse", file, "--json"]);
    expect(r.status).not.toBe(0);
    expect(r.stdout).toBe("");
    expect(r.stderr).toMatch(/cannot be used/);
    expect(r.stderr).not.toMatch(/\n\s+at /);
  });

  it("reports a missing file and a bad number plainly", () => {
    const missing = run(["analyse", path.join(tmp, "nope.csv"), "--json"]);
    expect(missing.status).not.toBe(0);
    expect(missing.stderr).toMatch(/cannot read/);
    const bad = run(["analyse", path.join(tmp, "nope.csv"), "--age", "abc"]);
    expect(bad.status).not.toBe(0);
    expect(bad.stderr).toMatch(/--age needs a number/);
    expect(bad.stderr).not.toMatch(/\n\s+at /);
  });
});
