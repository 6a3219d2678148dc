import { execFileSync, spawnSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { z } from "zod";
import { plainRampCsv } from "../../e2e/fixtures/plain-ramp.csv";

const bin = path.resolve(__dirname, "../../bin/cpet.mjs");
const tmp = fs.mkdtempSync(path.join(os.tmpdir(), "cpet-cli-"));

/** `cpet analyse --json` on the plain ramp with a separate lactate file of the given text. */
function rampWithLactate(name: string, lactateCsv: string) {
  const lac = path.join(tmp, `${name}.csv`);
  fs.writeFileSync(lac, lactateCsv);
  const file = path.join(tmp, `${name}-ramp.csv`);
  fs.writeFileSync(file, plainRampCsv());
  return JSON.parse(execFileSync(process.execPath, [bin, "analyse", file, "--json", "--lactate", lac], { encoding: "utf8" }));
}

function run(args: string[]) {
  return spawnSync(process.execPath, [bin, ...args], { encoding: "utf8", timeout: 60_000 });
}

// Every test here starts the command in its own Node process (each up to 60 s, `run`); with the accuracy banks running
// beside them on two cores a test with two starts took longer than the 20-s default, so these get the 90 s the
// plausibility test already had.
const CLI_TEST_TIMEOUT_MS = 90_000;

describe("cpet analyse (command line)", { timeout: CLI_TEST_TIMEOUT_MS }, () => {
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

  it("text mode gives units only with values and says which option a missing value needs", () => {
    const file = path.join(tmp, "ramp-text.csv");
    fs.writeFileSync(file, plainRampCsv());
    const without = run(["analyse", file]);
    expect(without.status).toBe(0);
    // Known by construction (e2e/fixtures/plain-ramp.csv.ts): highest 30-s average 2500 mL/min; no body mass given.
    expect(without.stdout).toMatch(/peak VO2\s+2500 mL\/min, per kg not determinable \(give --weight-kg\)/);
    expect(without.stdout).toMatch(/breathing reserve not determinable \(give --mvv-l-min or --fev1-l\)/);
    expect(without.stdout).not.toMatch(/not determinable (mL|%)/);
    expect(without.stdout).toMatch(/reviewed by a qualified clinician/);
    // the effort verdict in words, never its key (the JSON carries both: interpretation.effort.verdict and .label)
    const effortLine = without.stdout.split("\n").find((l) => l.startsWith("effort "))!;
    expect(effortLine).toMatch(/^effort {10}[A-Z][a-z]+ .+/);
    expect(effortLine).not.toMatch(/^effort\s+[a-z-]+$/);
    const withKg = run(["analyse", file, "--weight-kg", "80"]);
    // 2500 / 80 = 31.25 mL/kg/min, printed to one decimal
    expect(withKg.stdout).toMatch(/2500 mL\/min, 31\.3 mL\/kg\/min/);
  });

  it("refuses a file it cannot use with a plain message on stderr, no stack trace, non-zero exit", () => {
    const file = path.join(tmp, "bad.csv");
    fs.writeFileSync(file, "a,b\n1,2\n");
    const r = run(["analyse", file, "--json"]);
    expect(r.status).toBe(1);
    expect(r.stdout).toBe("");
    expect(r.stderr).toMatch(/cannot be used/);
    expect(r.stderr).not.toMatch(/\n\s+at /);
  });

  it("reports a missing file and a bad number plainly", () => {
    // exit status 1: the command is well formed, the file cannot be read; 2: the command itself is wrong
    const missing = run(["analyse", path.join(tmp, "nope.csv"), "--json"]);
    expect(missing.status).toBe(1);
    expect(missing.stderr).toMatch(/cannot read/);
    const bad = run(["analyse", path.join(tmp, "nope.csv"), "--age", "abc"]);
    expect(bad.status).toBe(2);
    expect(bad.stderr).toMatch(/--age needs a number/);
    expect(bad.stderr).not.toMatch(/\n\s+at /);
  });
});

describe("cpet analyse: full output on real and invented files", { timeout: CLI_TEST_TIMEOUT_MS }, () => {
  const schema = z.fromJSONSchema(JSON.parse(fs.readFileSync(path.resolve(__dirname, "../../cli/analyse.schema.json"), "utf8")));

  it("an invented heart-failure case gives every stable key, valid against cli/analyse.schema.json", () => {
    const file = path.resolve(__dirname, "../fixtures/cases/heart-failure.csv");
    const out = execFileSync(
      process.execPath,
      [
        bin,
        "analyse",
        file,
        "--json",
        "--sex",
        "male",
        "--age",
        "62",
        "--height-cm",
        "174",
        "--weight-kg",
        "80",
        "--fev1-l",
        "2.9",
        "--referral",
        "heart-failure",
      ],
      { encoding: "utf8" },
    );
    const json = JSON.parse(out);
    expect(schema.safeParse(json).success).toBe(true);
    // this demo reaches no determinable RCP: the slope "to RCP" says what it was fitted to instead
    expect(json.vt2.vo2MlMin).toBeNull();
    expect(json.veVco2Slope.toRcpFittedTo).toBe("VE/VCO2 slope to a fitted break (RCP not determinable)");
    // The schema really constrains: a missing stable key or a wrong confidence word is refused.
    const { vt1: _omit, ...withoutVt1 } = json;
    expect(schema.safeParse(withoutVt1).success).toBe(false);
    expect(schema.safeParse({ ...json, vt2: { ...json.vt2, confidence: "certain" } }).success).toBe(false);
    for (const key of ["vt1", "vt2"])
      expect(Object.keys(json[key])).toEqual(expect.arrayContaining(["vo2MlMin", "timeS", "confidence"]));
    expect(json.peak.vo2MlKgMin).toBeCloseTo(json.peak.vo2MlMin / 80, 6);
    // Breathing reserve from FEV1 × 40 (MVV estimate, recalled convention): MVV = 2.9 × 40 = 116 L/min.
    expect(json.breathingReserve.mvvLMin).toBeCloseTo(116, 6);
    expect(json.breathingReserve.pct).toBeCloseTo(100 * (1 - json.peak.veLMin / 116), 0);
    expect(json.predicted.vo2PeakMlMin.equationId).toBe("hansen-1984");
    expect(json.interpretation.schemes.length).toBeGreaterThan(0);
    expect(json.caution).toMatch(/qualified clinician/);
    expect(json.lactate).toBeNull();
    // VE/VCO2 at VT1 and at the ends of the VT1 band (the heart-failure demo's ratio is high, about 45, at all three)
    expect(json.veVco2Slope.atVt1).toBeGreaterThan(35);
    expect(Object.keys(json.veVco2Slope.atVt1BandEnds).sort()).toEqual(["high", "low"]);
    expect(schema.safeParse({ ...json, veVco2Slope: { ...json.veVco2Slope, atVt1BandEnds: { low: 1 } } }).success).toBe(false);
  });

  it("stage data with lactate (Sylta 2016, CC0) gives OBLA equal to the hand interpolation", () => {
    // Data from Sylta et al., Med Sci Sports Exerc 2016;48:2165–2174, as curated in the exscidata R package by D. Hammarström (CC0).
    const file = path.resolve(__dirname, "../fixtures/open-data/sylta2016-cycling/cyclingstudy_stages_long.csv");
    const out = execFileSync(
      process.execPath,
      [bin, "analyse", file, "--json", "--select", "subject=1", "--select", "timepoint=pre", "--weight-kg", "80.3"],
      {
        encoding: "utf8",
      },
    );
    const json = JSON.parse(out);
    // Subject 1, pre: lactate 3.54 mmol/L at 250 W and 6.21 at 275 W → 4 mmol/L at
    // 250 + 25 × (4 − 3.54) / (6.21 − 3.54) = 250 + 25 × 0.46 / 2.67 = 254.307 W (Sjödin & Jacobs 1981 OBLA, confirmed).
    expect(json.lactate.obla4.workW).toBeCloseTo(254.307, 2);
    expect(json.peak.vo2MlMin).toBe(4290); // highest stage VO2 in the file (275 W stage)
  });

  it("--stage-duration-s spaces the rows of a stage table without a time column (Sylta 2016, CC0: 5-min stages)", () => {
    // Data from Sylta et al., Med Sci Sports Exerc 2016;48:2165–2174, as curated in the exscidata R package by D. Hammarström (CC0).
    const file = path.resolve(__dirname, "../fixtures/open-data/sylta2016-cycling/cyclingstudy_stages_long.csv");
    const args = ["analyse", file, "--json", "--select", "subject=1", "--select", "timepoint=pre"];
    const json = JSON.parse(execFileSync(process.execPath, [bin, ...args, "--stage-duration-s", "300"], { encoding: "utf8" }));
    // subject 1, pre: 5 stage rows (README: 5-min steady-state steps) 300 s apart → 5 × 300 = 1500 s, the first stage too
    expect(json.durationS).toBe(1500);
    expect(
      json.issues.some((i: { message: string }) => /5 rows were read as consecutive stages 300 s apart/.test(i.message)),
    ).toBe(true);
    const bad = run([...args, "--stage-duration-s", "0"]);
    expect(bad.status).toBe(2);
    expect(bad.stderr).toMatch(/--stage-duration-s must be a number of seconds between 10 and 3600/);
  });

  it("--exercise-span sets the incremental phase by hand; a malformed span is refused before any work", () => {
    const file = path.join(tmp, "ramp-span.csv");
    fs.writeFileSync(file, plainRampCsv());
    const json = JSON.parse(
      execFileSync(process.execPath, [bin, "analyse", file, "--json", "--exercise-span", "0:00-5:00"], { encoding: "utf8" }),
    );
    // by construction VO2 = 500 + 2000·t/600: the highest 30-s average inside 0–300 s is the window 270–300 s,
    // mean t = 285 s → 500 + 2000 × 285 / 600 = 1450 mL/min
    expect(json.peak.vo2MlMin).toBeCloseTo(1450, 6);
    expect(json.issues.some((i: { code: string }) => i.code === "exercise-span-by-review")).toBe(true);
    const bad = run(["analyse", file, "--exercise-span", "5:00-1:00"]);
    expect(bad.status).toBe(2);
    expect(bad.stderr).toMatch(/--exercise-span needs start-end/);
    // a span past the end of the record is refused, not replaced by the detected phase
    const outside = run(["analyse", file, "--exercise-span", "6:00-99:00"]);
    expect(outside.status).toBe(2);
    expect(outside.stderr).toMatch(/--exercise-span 6:00-99:00 does not lie inside the record \(0:00-/);
    expect(outside.stdout).toBe("");
  });

  it("accepts a separate lactate file with --lactate", () => {
    // INVENTED samples on the plain ramp (work = time / 3 W): 1.0 → 6.0 mmol/L.
    const json = rampWithLactate("lactate", "time_s,lactate_mmol_l\n0,1.0\n150,1.1\n300,1.6\n450,2.9\n600,6.0\n");
    // 4 mmol/L between 450 s (2.9) and 600 s (6.0): t = 450 + 150 × 1.1 / 3.1 = 503.2 s → work = t / 3 = 167.7 W.
    expect(json.lactate.obla4.workW).toBeCloseTo(167.7, 0);
  });

  it("a lactate curve that never reaches 4 mmol/L gives null for OBLA with its reason in issues", () => {
    // INVENTED samples that stay below 4 mmol/L by construction (highest 3.2).
    const json = rampWithLactate("lactate-low", "time_s,lactate_mmol_l\n0,1.0\n150,1.1\n300,1.6\n450,2.4\n600,3.2\n");
    expect(json.lactate.obla4.workW).toBeNull();
    const why = json.issues.filter((i: { message: string }) => /OBLA/.test(i.message));
    expect(why.length).toBeGreaterThan(0);
    expect(why[0].code).toBe("not-determinable");
  });

  it("refuses patient values outside the plausibility limits shared with the upload form", () => {
    const file = path.join(tmp, "ramp4.csv");
    fs.writeFileSync(file, plainRampCsv());
    // a unit slip each: age in months, height in metres, FEV1 in mL (limits: lib/core/plausibleLimits.ts, common practice)
    for (const [flag, value, text] of [
      ["--age", "500", /Age \(years\) must lie between 5 and 110/],
      ["--height-cm", "1.75", /Height \(cm\) must lie between 100 and 230/],
      ["--fev1-l", "3200", /FEV1 \(L\) must lie between 0.2 and 8/],
      ["--weight-kg", "-80", /Weight \(kg\) must lie between 20 and 300/],
    ] as const) {
      const r = run(["analyse", file, "--json", flag, value]);
      expect(r.status).toBe(2);
      expect(r.stdout).toBe("");
      expect(r.stderr).toMatch(text);
    }
    // four CLI processes in one test: 13–14 s on a quiet 2-core machine, 30 s once under load; the default 20 s is for one
  });

  it("a usage error is one line and a pointer to the help, not the whole help text", () => {
    const r = run(["analyse", "--no-such-option"]);
    expect(r.status).toBe(2);
    expect(r.stderr.trim().split("\n").length).toBeLessThanOrEqual(2);
    expect(r.stderr).toMatch(/^cpet: error: /);
  });
});
