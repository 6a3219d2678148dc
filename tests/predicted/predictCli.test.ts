import { Command, CommanderError } from "commander";
import { describe, expect, it } from "vitest";
import { registerPredict } from "../../cli/predict";
import { EQUATIONS } from "../../lib/predicted";
import { CLINICAL_CAUTION } from "../../lib/report/caution";

async function run(args: string[]) {
  let out = "";
  let err = "";
  const program = new Command().name("cpet").exitOverride();
  program.configureOutput({ writeOut: (s) => (out += s), writeErr: (s) => (err += s) });
  registerPredict(program);
  let exitCode = 0;
  try {
    await program.parseAsync(["node", "cpet", "predict", ...args]);
  } catch (e) {
    if (!(e instanceof CommanderError)) throw e;
    exitCode = e.exitCode;
  }
  return { out, err, exitCode };
}

const man = ["--sex", "male", "--age", "50", "--height-cm", "175", "--weight-kg", "80"];

describe("cpet predict", () => {
  it("--equation friend-2017 --json: vo2PeakMlMin in mL/min (38.00106 mL/kg/min × 80 kg = 3040.085)", async () => {
    const r = await run([...man, "--ergometer", "treadmill", "--equation", "friend-2017", "--json"]);
    expect(r.exitCode).toBe(0);
    expect(r.err).toBe("");
    const json = JSON.parse(r.out);
    expect(json.vo2PeakMlMin).toBeCloseTo(3040.085, 2);
    expect(json.vo2PeakMlKgMin).toBeCloseTo(38.00106, 4);
    expect(json.equationId).toBe("friend-2017");
  });

  it("--equation hansen-1984 --json: 2505.6 mL/min (clinical-reference §1.2)", async () => {
    const json = JSON.parse((await run([...man, "--ergometer", "cycle", "--equation", "hansen-1984", "--json"])).out);
    expect(Math.abs(json.vo2PeakMlMin - 2505.6)).toBeLessThanOrEqual(0.05);
  });

  it("without --equation: every applicable quantity from the lab defaults, each with its equation id", async () => {
    const r = await run([...man, "--ergometer", "cycle", "--fev1-l", "3.2", "--json"]);
    const json = JSON.parse(r.out);
    for (const q of [
      "vo2PeakMlMin",
      "vo2PeakMlKgMin",
      "workMaxW",
      "hrMaxBpm",
      "o2PulseMaxMlBeat",
      "veVco2NadirRatio",
      "mvvLMin",
    ]) {
      expect(typeof json[q].equationId, q).toBe("string");
      expect(typeof json[q].value, q).toBe("number");
    }
    expect(json.vo2PeakMlMin.equationId).toBe("hansen-1984");
    expect(json.mvvLMin.value).toBeCloseTo(128, 10); // 3.2 × 40
  });

  it("--list prints every equation id, then the caution", async () => {
    const r = await run(["--list"]);
    const lines = r.out.trim().split("\n");
    expect(lines.slice(0, -1).map((l) => l.split("\t")[0])).toEqual(EQUATIONS.map((e) => e.id));
    expect(lines[lines.length - 1]).toBe(CLINICAL_CAUTION);
  });

  it("text answer: each value with its equation and evidence status, every warning, and the caution", async () => {
    // an 8-year-old on adult equations: Hansen 1984 (adults) and ERS 2019 adult cycle HRmax (20–80 y) are extrapolations
    const r = await run(["--sex", "male", "--age", "8", "--height-cm", "130", "--weight-kg", "25"]);
    expect(r.out).toMatch(/^vo2PeakMlMin\t\d+ mL\/min\t\thansen-1984 \((confirmed|secondary|recalled)\)$/m);
    expect(r.out).toMatch(/^warning: .*age 8 y is outside the derivation range 20–80 y; the prediction is an extrapolation\.$/m);
    expect(r.out.trim().split("\n").pop()).toBe(CLINICAL_CAUTION);
    // one equation on the other ergometer: the value, its other form, the mismatch, the caution
    const one = await run([...man, "--ergometer", "cycle", "--equation", "friend-2017"]);
    expect(one.out).toMatch(/^vo2PeakMlKgMin\t38\.00 mL\/kg\/min\tLLN [\d.]+\tfriend-2017/m);
    expect(one.out).toMatch(/^vo2PeakMlMin\t3040 mL\/min$/m); // 38.00106 × 80 kg
    expect(one.out).toMatch(/^warning: .*derived on a treadmill; this test used a cycle\.$/m);
  });

  it.each([
    [["--sex", "other", "--age", "50", "--height-cm", "175", "--weight-kg", "80"], /--sex must be male or female/],
    [["--sex", "male", "--age", "abc", "--height-cm", "175", "--weight-kg", "80"], /--age needs a number/],
    [["--sex", "male", "--age", "50", "--height-cm", "175"], /--weight-kg is required/],
    [[...man, "--ergometer", "rowing"], /--ergometer must be cycle or treadmill/],
    [[...man, "--equation", "nope"], /no reference equation "nope"/],
  ])("bad input %j → exit status 2 (the command is wrong), plain message on stderr, nothing on stdout", async (args, message) => {
    const r = await run([...args, "--json"]);
    expect(r.exitCode).toBe(2);
    expect(r.out).toBe("");
    expect(r.err).toMatch(message);
    expect(r.err).not.toMatch(/\n\s+at /);
  });
});
