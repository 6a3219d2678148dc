import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import {
  importBloodGasFile,
  importLactateFile,
  parseTimeText,
  mappingProfileSchema,
  parseSpirometry,
  recogniseHeader,
  PLAIN_COLUMNS,
  type MappingProfile,
} from "../../lib/breath";

const enc = (s: string) => new TextEncoder().encode(s);

describe("importLactateFile", () => {
  it("Sylta 2016 stage lactate (CC0): one sample per load", async () => {
    // Data from Sylta et al., Med Sci Sports Exerc 2016;48:2165–2174, as curated in the exscidata R package
    // by D. Hammarström (CC0). First occasion of subject 1: loads 125–275 W, lactate 1.5 … 6.21 mmol/L.
    const text = new TextDecoder().decode(
      readFileSync(new URL("../fixtures/open-data/sylta2016-cycling/cyclingstudy_stages_long.csv", import.meta.url)),
    );
    const lines = text.trim().split("\n");
    const subset = [lines[0], ...lines.slice(1).filter((l) => l.startsWith("1,INCR,pre,"))].join("\n");
    const r = await importLactateFile(enc(subset));
    expect(r.samples.map((s) => [s.workW, s.lactateMmolL])).toEqual([
      [125, 1.5],
      [175, 1.86],
      [225, 2.38],
      [250, 3.54],
      [275, 6.21],
    ]);
  });

  // mg/dL → mmol/L for lactate: ÷ 9.008, from the molar mass of lactic acid, 90.08 g/mol (1 mmol/L = 90.08 mg/L =
  // 9.008 mg/dL; standard chemistry, common practice). Plausible range 0.1–30 mmol/L: our generous plausibility
  // limit, common practice (LACTATE_RANGE in lib/breath/importLactateFile.ts), not a published value.
  it("invented sample file: m:ss times, decimal comma, mg/dL converted (÷ 9.008, lib/units)", async () => {
    const r = await importLactateFile(enc("Time;Stage;Lactate (mg/dL)\n3:00;1;9,008\n6:00;2;18,016\n9:00;3;999\n"));
    expect(r.samples).toEqual([
      { timeS: 180, stage: 1, lactateMmolL: 1 },
      { timeS: 360, stage: 2, lactateMmolL: 2 },
    ]);
    // 9.008 mg/dL ÷ 9.008 = 1 mmol/L, 18.016 ÷ 9.008 = 2; 999 mg/dL ÷ 9.008 = 110.9 mmol/L lies outside 0.1–30
    expect(r.issues.find((i) => i.code === "implausible-values")?.where?.row).toBe(4);
    // the conversion is said, so the thresholds read from these samples can be traced to it
    expect(r.issues.find((i) => i.code === "lactate-converted")?.message).toBe(
      "Lactate was given in mg/dL and converted to mmol/L (÷ 9.008, from the molar mass of lactate) for every threshold read from it.",
    );
    expect((await importLactateFile(enc("Time;Lactate (mmol/L)\n3:00;1,2\n6:00;2,4\n"))).issues.map((i) => i.code)).not.toContain(
      "lactate-converted",
    );
  });

  it("no lactate column, or nothing to place the samples by", async () => {
    expect((await importLactateFile(enc("time,hr\n1,2\n3,4\n"))).issues.map((i) => i.code)).toContain("no-lactate-column");
    expect((await importLactateFile(enc("lactate,comment\n1.2,a\n3.4,b\n"))).issues.map((i) => i.code)).toContain(
      "lactate-no-position",
    );
    expect((await importLactateFile(new Uint8Array())).issues.map((i) => i.code)).toEqual(["empty-file"]);
  });
});

describe("importBloodGasFile", () => {
  it("invented samples in kPa: converted to mmHg (1 kPa = 7.50062 mmHg: 1 mmHg = 133.322 Pa, standard definition, common practice)", async () => {
    const r = await importBloodGasFile(enc("time (min),PaO2 (kPa),PaCO2 (kPa),label\n0,13.3,5.3,rest\n12,12.0,4.6,peak\n"));
    expect(r.samples).toHaveLength(2);
    expect(r.samples[0].timeS).toBe(0);
    expect(r.samples[1].timeS).toBe(720);
    expect(r.samples[0].paO2MmHg).toBeCloseTo(13.3 * 7.50062, 6); // 99.76 mmHg
    expect(r.samples[1].paCO2MmHg).toBeCloseTo(4.6 * 7.50062, 6); // 34.50 mmHg
    expect(r.samples[1].label).toBe("peak");
  });

  it("mmHg without a unit stays mmHg; no blood-gas column is an error", async () => {
    const r = await importBloodGasFile(enc("time,PaO2,PaCO2\n0,95,40\n600,88,35\n"));
    expect(r.samples[1]).toEqual({ timeS: 600, paO2MmHg: 88, paCO2MmHg: 35 });
    expect((await importBloodGasFile(enc("time,hr\n0,60\n1,70\n"))).issues.map((i) => i.code)).toContain("no-blood-gas-column");
  });
});

describe("parseSpirometry", () => {
  // MVV 5000 L/min is far outside 10–300 L/min, our generous plausibility limit, common practice (PLAUSIBLE_LIMITS in
  // lib/core, as parseSpirometry states), not a published value; FEV1 3.1 L and FVC 4.2 L lie inside 0.2–8 and 0.3–10 L.
  it("accepts numbers and decimal-comma strings; leaves out implausible values", () => {
    const r = parseSpirometry({ fev1L: "3,1", fvcL: 4.2, mvvLMin: 5000 });
    expect(r.spirometry).toEqual({ fev1L: 3.1, fvcL: 4.2 });
    expect(r.issues.map((i) => i.where?.field)).toEqual(["mvvLMin"]);
    expect(parseSpirometry({ fev1L: 4, fvcL: 3 }).issues[0].message).toMatch(/larger than FVC/);
    expect(parseSpirometry(null)).toEqual({ spirometry: null, issues: [] });
  });
});

describe("mapping profiles and header spellings", () => {
  it("a mapping profile is plain data that round-trips through JSON and the zod schema", () => {
    const profile: MappingProfile = {
      name: "Lab A export",
      mapping: { "V'O2": { field: "vo2MlMin", unit: "L/min" }, Marker: { field: "phase" }, Notes: { field: null } },
    };
    Object.freeze(profile);
    const parsed = mappingProfileSchema.safeParse(JSON.parse(JSON.stringify(profile)));
    expect(parsed.success && parsed.data).toEqual(profile);
    expect(mappingProfileSchema.safeParse({ name: "", mapping: {} }).success).toBe(false);
    expect(mappingProfileSchema.safeParse({ name: "x", mapping: { a: { field: "notAField" } } }).success).toBe(false);
  });

  it.each([
    ["VO2", "vo2MlMin", undefined],
    ["V'O2 (l/min)", "vo2MlMin", "L/min"],
    ["VO2 STPD", "vo2MlMin", undefined],
    ["VO2/kg", "vo2MlMin", "per-kg"],
    ["VO2 (mL·kg⁻¹·min⁻¹)", "vo2MlMin", "per-kg"],
    ["VE BTPS", "veLMin", undefined],
    ["HR (1/min)", "hrBpm", "1/min"],
    ["RR interval", "hrBpm", "ms"],
    ["R-R (ms)", "rrBrMin", "ms"],
    ["IBI", "hrBpm", "ms"],
    ["NN interval (ms)", "hrBpm", "ms"],
    ["Watts", "workW", undefined],
    ["Last", "workW", undefined],
    ["Leistung (W)", "workW", "W"],
    ["Carga", "workW", undefined],
    ["Incline %", "gradePct", "%"],
    ["Steigung (%)", "gradePct", "%"],
    ["Vitesse (km/h)", "speedKmh", "km/h"],
    ["PET O2", "peto2MmHg", undefined],
    ["PetCO2 (kPa)", "petco2MmHg", "kPa"],
    ["Rf", "rrBrMin", undefined],
    ["Vt (ml)", "vtL", "mL"],
    ["La", "lactateMmolL", undefined],
    ["Stage", "stage", undefined],
    ["Event", "phase", undefined],
    ["Time (hh:mm:ss)", "timeS", "clock"],
    ["Clock time", "timeS", undefined],
    ["Time of day", "timeS", undefined],
    ["Uhrzeit", "timeS", undefined],
  ])("%s → %s (%s)", (header, field, unit) => {
    const r = recogniseHeader(header, PLAIN_COLUMNS);
    expect(r.field).toBe(field);
    expect(r.unit).toBe(unit);
  });

  it.each(["RER", "VE/VO2", "VO2/HR", "vo2max", "baseline_vo2", "n_active_stages"])(
    "%s is not imported as a measured column",
    (header) => {
      expect(recogniseHeader(header, PLAIN_COLUMNS).field).toBeUndefined();
    },
  );
});

describe("parseTimeText (times typed in forms and options)", () => {
  it("reads m:ss, h:mm:ss and seconds as the files' clock does, and refuses the rest", () => {
    // by hand: 6:00 = 360 s; 16:30.5 = 990.5 s; 1:02:30 = 3 750 s
    expect(parseTimeText("6:00")).toBe(360);
    expect(parseTimeText(" 16:30.5 ")).toBe(990.5);
    expect(parseTimeText("1:02:30")).toBe(3750);
    expect(parseTimeText("360")).toBe(360);
    for (const bad of ["", "six", "-5", "-1:00", "6:00-7:00"]) expect(parseTimeText(bad)).toBeNaN();
  });
});
