/**
 * Blood-gas import: times, labels and the time unit. Every file below is INVENTED; the expected times are known by
 * construction (minutes × 60 = seconds; m:ss read as a clock) and the kPa conversion is 1 kPa = 7.50062 mmHg
 * (1 mmHg = 133.322 Pa, standard definition, common practice).
 */
import { describe, expect, it } from "vitest";
import { bloodGasMoment, bloodGasTimeS, importBloodGasFile } from "../../lib/breath";

const enc = (s: string) => new TextEncoder().encode(s);
const codes = (r: { issues: { code: string }[] }) => r.issues.map((i) => i.code);

describe("importBloodGasFile: samples without a time are never given one", () => {
  it("labels only (no time column): kept with their labels and no time; placed at analysis", async () => {
    const r = await importBloodGasFile(enc("label,PaO2,PaCO2\nrest,12.7,5.3\npeak,11.7,4.8\n"));
    expect(r.samples).toHaveLength(2);
    expect(r.samples.map((s) => s.label)).toEqual(["rest", "peak"]);
    expect(r.samples.map(bloodGasTimeS)).toEqual([undefined, undefined]);
    expect(r.samples[0].paCO2MmHg).toBeCloseTo(5.3 * 7.50062, 9); // 39.753 mmHg
    const noTime = r.issues.find((i) => i.code === "no-time-column")!;
    expect(noTime.severity).toBe("info");
    expect(noTime.message).toMatch(/placed by its label/);
    expect(r.issues.filter((i) => i.severity !== "info")).toEqual([]);
  });

  it("a sample with neither a time nor a recognisable label is kept, with a warning naming its row", async () => {
    const r = await importBloodGasFile(enc("time,label,PaO2,PaCO2\n120,rest,95,40\n,sample A,90,38\n,peak,88,36\n"));
    expect(r.samples).toHaveLength(3);
    expect(bloodGasTimeS(r.samples[0])).toBe(120);
    expect(bloodGasTimeS(r.samples[1])).toBeUndefined();
    const w = r.issues.find((i) => i.code === "blood-gas-without-time")!;
    expect(w.severity).toBe("warning");
    expect(w.message).toMatch(/row 3, label "sample A"/);
    expect(w.message).toMatch(/kept but not used for VD\/VT/);
    expect(codes(r)).toContain("blood-gas-placed-by-label"); // the "peak" row without a time
  });

  it("no time column and no usable label: samples kept, warnings say why", async () => {
    const r = await importBloodGasFile(enc("PaO2,PaCO2\n95,40\n88,36\n"));
    expect(r.samples).toHaveLength(2);
    expect(r.issues.filter((i) => i.severity === "warning").map((i) => i.code)).toEqual([
      "no-time-column",
      "blood-gas-without-time",
    ]);
  });
});

describe("importBloodGasFile: the time unit", () => {
  const minutes = "time,PaO2,PaCO2\n2,95,40\n15,88,36\n";

  it("plain numbers are seconds by default, with a warning when they all fall in the first minute", async () => {
    const r = await importBloodGasFile(enc(minutes));
    expect(r.samples.map((s) => s.timeS)).toEqual([2, 15]);
    const w = r.issues.find((i) => i.code === "blood-gas-time-unit")!;
    expect(w.severity).toBe("warning");
    expect(w.message).toMatch(/choose "minutes"/);
  });

  it("minutes chosen on the form: 2 and 15 min → 120 and 900 s", async () => {
    const r = await importBloodGasFile(enc(minutes), { timeUnit: "min" });
    expect(r.samples.map((s) => s.timeS)).toEqual([120, 900]);
    expect(r.issues.find((i) => i.code === "blood-gas-time-unit")?.severity).toBe("info");
  });

  it("the header's unit wins over the form; m:ss cells are a clock whatever the form says", async () => {
    const s = await importBloodGasFile(enc("time (s),PaO2,PaCO2\n120,95,40\n900,88,36\n"), { timeUnit: "min" });
    expect(s.samples.map((x) => x.timeS)).toEqual([120, 900]);
    const clock = await importBloodGasFile(enc("time,PaO2,PaCO2\n02:00,95,40\n15:00,88,36\n"), { timeUnit: "min" });
    expect(clock.samples.map((x) => x.timeS)).toEqual([120, 900]);
    const m = await importBloodGasFile(enc("time (min),PaO2,PaCO2\n2,95,40\n15,88,36\n"));
    expect(m.samples.map((x) => x.timeS)).toEqual([120, 900]);
  });
});

describe("bloodGasMoment: the moment a label names (English words of the trade, common practice)", () => {
  it.each([
    ["rest", "rest"],
    ["Resting", "rest"],
    ["baseline", "rest"],
    ["pre-exercise", "rest"],
    ["unloaded", "warmup"],
    ["warm-up", "warmup"],
    ["peak", "peak"],
    ["Peak exercise", "peak"],
    ["max", "peak"],
    ["end of exercise", "peak"],
    ["end-ex", "peak"],
    ["recovery 3 min", "recovery"],
    ["post-exercise", "recovery"],
    ["post peak", "recovery"],
  ])("%s → %s", (label, kind) => {
    expect(bloodGasMoment(label)?.kind).toBe(kind);
  });

  it("stage N names stage N; a bare 'exercise', 'submax' or free text names no moment", () => {
    expect(bloodGasMoment("Stage 3")).toEqual({ kind: "stage", stage: 3 });
    expect(bloodGasMoment("step 12")).toEqual({ kind: "stage", stage: 12 });
    for (const t of ["exercise", "submax", "sample A", "", undefined]) expect(bloodGasMoment(t)).toBeUndefined();
  });

  it("a time lost in JSON (null) or never given (NaN) is no time", () => {
    expect(bloodGasTimeS(JSON.parse('{"timeS":null,"paCO2MmHg":40}'))).toBeUndefined();
    expect(bloodGasTimeS({ timeS: Number.NaN })).toBeUndefined();
    expect(bloodGasTimeS({ timeS: 0 })).toBe(0);
  });
});
