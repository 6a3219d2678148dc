import { describe, expect, it } from "vitest";
import { importBreathFile, importLactateFile } from "../../lib/breath";

describe("a column mostly outside its plausible range", () => {
  it("is set aside whole: its few in-range values are in the same wrong unit (INVENTED per-kg VCO2 under a plain header)", async () => {
    // VCO2 per kg 4.0 … 37.2 mL/kg/min written without a unit: read as mL/min, 30–37 lies inside 30–10 000 mL/min
    // (PLAUSIBLE_RANGE, common practice) but 4–29 does not, so most of the column is out of range
    const lines = ["time_s,vo2_ml_min,VCO2"];
    for (let i = 0; i < 120; i++) lines.push(`${5 * i},${400 + 20 * i},${((0.9 * (400 + 20 * i)) / 75).toFixed(1)}`);
    const r = await importBreathFile(new TextEncoder().encode(lines.join("\n")));
    const note = r.issues.find((i) => i.code === "column-mostly-implausible")!;
    expect(note.message).toMatch(/the whole column was set aside/);
    expect(r.table!.rows.every((x) => x.vco2MlMin === undefined)).toBe(true);
    expect(r.table!.rows.filter((x) => x.vo2MlMin !== undefined)).toHaveLength(120);
  });
});

describe("end-tidal gas fractions and files holding several tests", () => {
  const enc = (t: string) => new TextEncoder().encode(t);
  const rows = (header: string, row: (i: number) => string) =>
    [header, ...Array.from({ length: 60 }, (_, i) => row(i))].join("\n");

  it("FETCO2 (%) is named as not used, a warning when no end-tidal pressure is in the file (INVENTED values)", async () => {
    const only = await importBreathFile(enc(rows("time_s,vo2_ml_min,FETCO2 (%)", (i) => `${5 * i},${500 + 20 * i},5.${i % 10}`)));
    const note = only.issues.find((i) => i.code === "end-tidal-fraction-not-used")!;
    expect(note.severity).toBe("warning");
    expect(note.message).toMatch(/end-tidal methods \(PETCO2, PETO2\) have no data/);
    const both = await importBreathFile(
      enc(rows("time_s,vo2_ml_min,FETCO2 (%),petco2_mmhg", (i) => `${5 * i},${500 + 20 * i},5.${i % 10},${38 + (i % 3)}`)),
    );
    expect(both.issues.find((i) => i.code === "end-tidal-fraction-not-used")?.severity).toBe("info");
    expect(both.table!.fields).toContain("petco2MmHg");
  });

  it("several tests without a time column: only the choice of a test is asked for (Sylta-like stage rows, INVENTED)", async () => {
    const text = [
      "subject,load_w,vo2_ml_min",
      ...Array.from({ length: 50 }, (_, i) => `${1 + (i % 10)},${100 + 25 * Math.floor(i / 10)},${2000 + 10 * i}`),
    ];
    const r = await importBreathFile(enc(text.join("\n")));
    expect(r.table).toBeNull();
    expect(r.issues.filter((i) => i.severity === "error").map((i) => i.code)).toEqual(["several-records"]);
  });
});

describe("options that do not apply are said, not ignored silently (INVENTED files)", () => {
  const enc = (t: string) => new TextEncoder().encode(t);

  it("a stage duration given for a file with a time column", async () => {
    const text = ["time_s,vo2_ml_min", ...Array.from({ length: 30 }, (_, i) => `${5 * i},${500 + 20 * i}`)].join("\n");
    const r = await importBreathFile(enc(text), { stageDurationS: 180 });
    expect(r.issues.find((i) => i.code === "stage-duration-not-used")?.message).toMatch(/time column \("time_s"\).*180 s/);
    expect(r.table!.rows[1].timeS).toBe(5);
  });

  it("a lactate time unit that the header overrides", async () => {
    const r = await importLactateFile(enc("time_s,lactate_mmol_l\n0,1.0\n120,1.2\n240,1.8\n360,3.0\n480,5.1\n"), {
      timeUnit: "min",
    });
    expect(r.issues.find((i) => i.code === "lactate-time-unit-from-header")?.message).toMatch(
      /gives the unit s; the time unit chosen \(min\)/,
    );
    expect(r.samples[1].timeS).toBe(120); // read in the header's seconds, not as 120 min
  });
});
