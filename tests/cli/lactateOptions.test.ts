import { spawnSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { z } from "zod";
import { plainRampCsv } from "../../e2e/fixtures/plain-ramp.csv";

const bin = path.resolve(__dirname, "../../bin/cpet.mjs");
const tmp = fs.mkdtempSync(path.join(os.tmpdir(), "cpet-cli-lactate-"));
const schema = z.fromJSONSchema(JSON.parse(fs.readFileSync(path.resolve(__dirname, "../../cli/analyse.schema.json"), "utf8")));

function write(name: string, text: string): string {
  const file = path.join(tmp, name);
  fs.writeFileSync(file, text);
  return file;
}
function run(args: string[]) {
  return spawnSync(process.execPath, [bin, ...args], { encoding: "utf8", timeout: 60_000 });
}
const ramp = () => write("ramp.csv", plainRampCsv());
type Issue = { severity: string; code: string; message: string; where?: { field?: string } };

// Each test starts the command in its own Node process (see tests/cli/analyse.test.ts for the timeout).
describe("cpet analyse: lactate options and issues", { timeout: 90_000 }, () => {
  it("--lactate-time-unit min reads plain-number minutes: the same OBLA as the seconds file", () => {
    // INVENTED samples on the plain ramp (work = time / 3 W): 0, 2.5, 5, 7.5, 10 min = 0, 150, 300, 450, 600 s.
    const lac = write("lac-min.csv", "time,lactate\n0,1.0\n2.5,1.1\n5,1.6\n7.5,2.9\n10,6.0\n");
    const r = run(["analyse", ramp(), "--json", "--lactate", lac, "--lactate-time-unit", "min"]);
    expect(r.status).toBe(0);
    const json = JSON.parse(r.stdout);
    // 4 mmol/L between 450 s (2.9) and 600 s (6.0): t = 450 + 150 × 1.1/3.1 = 503.2 s → work = t/3 = 167.7 W
    expect(json.lactate.obla4.workW).toBeCloseTo(167.7, 0);
    expect(schema.safeParse(json).success).toBe(true);
    const bad = run(["analyse", ramp(), "--lactate", lac, "--lactate-time-unit", "hours"]);
    // a wrong option value is a mistake in the command: exit status 2
    expect(bad.status).toBe(2);
    expect(bad.stderr).toMatch(/--lactate-time-unit must be s or min/);
  });

  it("lactate issues reach the CLI issues: samples without a position are counted (JSON and text)", () => {
    // INVENTED: rows 2 and 4 give a lactate only
    const lac = write("lac-missing.csv", "time_s,work_w,lactate_mmol_l\n,,1.0\n150,,1.1\n,,1.4\n300,,1.6\n450,,2.9\n600,,6.0\n");
    const json = JSON.parse(run(["analyse", ramp(), "--json", "--lactate", lac]).stdout);
    const w = (json.issues as Issue[]).find((i) => i.code === "lactate-without-position");
    expect(w?.message).toBe("2 lactate sample(s) (rows 2, 4) give no time, stage, work rate or speed and were left out.");
    expect(run(["analyse", ramp(), "--lactate", lac]).stdout).toMatch(/warning: 2 lactate sample\(s\) \(rows 2, 4\)/);
  });

  it("mg/dL without a unit is read as mg/dL; an open unit is refused with a question", () => {
    // INVENTED: 1.0, 1.1, 1.6, 2.9, 6.0 mmol/L × 9.008 = 9.0, 9.9, 14.4, 26.1, 54.0 mg/dL
    const mg = write("lac-mg.csv", "time_s,lactate\n0,9.0\n150,9.9\n300,14.4\n450,26.1\n600,54.0\n");
    const json = JSON.parse(run(["analyse", ramp(), "--json", "--lactate", mg]).stdout);
    expect((json.issues as Issue[]).map((i) => i.code)).toContain("lactate-unit-inferred");
    // 26.1/9.008 = 2.897, 54.0/9.008 = 5.995: t = 450 + 150 × (4 − 2.897)/(5.995 − 2.897) = 503.4 s → 167.8 W
    expect(json.lactate.obla4.workW).toBeCloseTo(167.8, 0);
    const open = write("lac-open.csv", "time_s,lactate\n0,9.0\n150,9.9\n300,14.4\n450,26.1\n");
    const refused = run(["analyse", ramp(), "--lactate", open]);
    // the command is well formed; the file cannot be used as it stands: exit status 1
    expect(refused.status).toBe(1);
    expect(refused.stderr).toMatch(/Are the values in mg\/dL/);
    const said = JSON.parse(run(["analyse", ramp(), "--json", "--lactate", open, "--lactate-unit", "mg/dL"]).stdout);
    expect(said.lactate.thresholds.length).toBe(5);
  });

  it("lactate by speed: OBLA given as a speed is not listed as missing; every method by its name", () => {
    // INVENTED treadmill stage table: 3-min stages 8 … 16 km/h; lactate 1.0, 1.3, 2.0, 3.5, 6.0 mmol/L
    const file = write(
      "tread.csv",
      "time_s,speed_kmh,vo2_ml_min,hr_bpm,lactate_mmol_l\n180,8,1800,120,1.0\n360,10,2300,135,1.3\n540,12,2800,150,2.0\n720,14,3300,165,3.5\n900,16,3800,180,6.0\n",
    );
    const r = run(["analyse", file, "--ergometer", "treadmill", "--stage-duration-s", "180"]);
    expect(r.status).toBe(0);
    // 4 mmol/L between 14 (3.5) and 16 km/h (6.0): 14 + 0.5/2.5 × 2 = 14.4 km/h
    // heart rate at OBLA from the same stage rows, by speed: 165 + (14.4 − 14)/(16 − 14) × (180 − 165) = 168 bpm
    expect(r.stdout).toMatch(/lactate 4 mmol\/L 14\.4 km\/h \(heart rate 168 bpm\) \(samples placed by speed/);
    expect(r.stdout).toMatch(/Baseline \+ 1 mmol\/L \d+\.\d km\/h/);
    expect(r.stdout).not.toMatch(/lactate\.obla4/);
    expect(r.stdout).not.toMatch(/not determinable: Lactate 4 mmol\/L/);
    const json = JSON.parse(run(["analyse", file, "--json", "--ergometer", "treadmill"]).stdout);
    const why = (json.issues as Issue[]).find((i) => i.where?.field === "lactate.obla4.workW")!;
    expect(why.message).toMatch(/OBLA is given as a speed \(14\.4 km\/h\)/);
    expect(json.lactate.thresholds[0]).toMatchObject({ method: "obla-4", name: "OBLA (4 mmol/L)", estimates: "VT2" });
    // VO2 at OBLA: 3300 + 0.2 × (3800 − 3300) = 3400 mL/min; HR 168 bpm (as above)
    expect(json.lactate.thresholds[0].hrBpm).toBeCloseTo(168, 6);
    expect(json.lactate.thresholds[0].vo2MlMin).toBeCloseTo(3400, 6);
  });
});
