import { describe, expect, it } from "vitest";
import { importLactateFile } from "../../lib/breath";

const enc = (s: string) => new TextEncoder().encode(s);

// INVENTED lactate files. The unit rule (our choice) rests on: resting blood lactate about 0.5–2 mmol/L (common
// practice, recalled textbook range); no blood lactate reaches 30 mmol/L (the importer's plausible range, common
// practice); 1 mmol/L = 9.008 mg/dL (molar mass of lactate 90.08 g/mol, lib/units).

/** A normal curve (1.0 … 6.8 mmol/L) written in mg/dL: 1.0 × 9.008 ≈ 9.0 … 6.8 × 9.008 ≈ 61.3. */
const MG_DL_NO_UNIT = "work_w,lactate\n35,9.0\n60,9.9\n85,10.8\n110,13.5\n135,18.0\n160,24.3\n185,32.4\n210,45.0\n235,61.3\n";

describe("lactate unit when the header names none", () => {
  it("lowest ≥ 4.5 and highest > 30: read as mg/dL and said so", async () => {
    const r = await importLactateFile(enc(MG_DL_NO_UNIT));
    expect(r.samples).toHaveLength(9);
    // 9.0 mg/dL ÷ 9.008 = 0.9991 mmol/L; 61.3 ÷ 9.008 = 6.805 mmol/L
    expect(r.samples[0].lactateMmolL).toBeCloseTo(9 / 9.008, 9);
    expect(r.samples[8].lactateMmolL).toBeCloseTo(61.3 / 9.008, 9);
    const note = r.issues.find((i) => i.code === "lactate-unit-inferred")!;
    expect(note.severity).toBe("info");
    expect(note.message).toMatch(/values \(9–61\.3\) were read as mg\/dL/);
    // nothing set aside as implausible (before: 3 values > 30 "mmol/L" were dropped and 9 mmol/L kept as resting)
    expect(r.issues.map((i) => i.code)).not.toContain("implausible-values");
  });

  it("lowest ≥ 4.5 and highest ≤ 30 in three samples or more: refused with a question, no sample kept", async () => {
    const r = await importLactateFile(enc("work_w,lactate\n35,9.0\n60,9.9\n85,10.8\n110,13.5\n135,18.0\n160,24.3\n"));
    expect(r.samples).toHaveLength(0);
    const q = r.issues.find((i) => i.code === "lactate-unit-unclear")!;
    expect(q.severity).toBe("error");
    // 9 mg/dL ÷ 9.008 = 0.999 → "1 mmol/L"
    expect(q.message).toMatch(/Are the values in mg\/dL \(9 mg\/dL = 1 mmol\/L\)\?/);
    expect(q.message).toMatch(/--lactate-unit/);
  });

  it("the same values with the unit said (header or option) are read in that unit", async () => {
    const values = "\n35,9.0\n60,9.9\n85,10.8\n110,13.5\n135,18.0\n160,24.3\n";
    const mmol = await importLactateFile(enc(`work_w,lactate_mmol_l${values}`));
    expect(mmol.samples[0].lactateMmolL).toBe(9);
    const mg = await importLactateFile(enc(`work_w,lactate${values}`), { lactateUnit: "mg/dL" });
    expect(mg.samples[0].lactateMmolL).toBeCloseTo(9 / 9.008, 9);
    const asMmol = await importLactateFile(enc(`work_w,lactate${values}`), { lactateUnit: "mmol/L" });
    expect(asMmol.samples[0].lactateMmolL).toBe(9);
  });

  it("a usual mmol/L curve without a unit stays mmol/L with no note", async () => {
    const r = await importLactateFile(enc("work_w,lactate\n60,1.1\n160,2.7\n235,6.8\n"));
    expect(r.samples.map((s) => s.lactateMmolL)).toEqual([1.1, 2.7, 6.8]);
    expect(r.issues).toEqual([]);
  });
});

describe("lactate samples that nothing places in the test", () => {
  it("rows with only a lactate value are counted, with their rows, never dropped silently", async () => {
    // INVENTED (as the explore round's lac_missing.csv): rows 2 and 6 give a lactate and nothing else
    const text =
      "time_s,work_w,lactate_mmol_l\n,,1.0\n420,,1.0\n,85,1.2\n600,,1.5\n,,2.0\n720,,2.7\n780,,3.6\n,210,5.0\n900,,6.8\n";
    const r = await importLactateFile(enc(text));
    expect(r.samples).toHaveLength(7);
    const w = r.issues.find((i) => i.code === "lactate-without-position")!;
    expect(w.severity).toBe("warning");
    expect(w.message).toBe("2 lactate sample(s) (rows 2, 6) give no time, stage, work rate or speed and were left out.");
  });
});

describe("lactate time unit", () => {
  it("plain-number times in minutes when the caller says so: 2 min → 120 s", async () => {
    const r = await importLactateFile(enc("time,lactate\n2,1.0\n15,6.8\n"), { timeUnit: "min" });
    expect(r.samples.map((s) => s.timeS)).toEqual([120, 900]);
  });
});
