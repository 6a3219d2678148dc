import { describe, it, expect } from "vitest";
import { vdVt } from "../../lib/thresholds/vdVt";
import { buildRows, makeTest } from "./indicesFixture";

// Invented: VE/VCO2 fixed at 30 (VCO2 1000 mL/min, VE 30 L/min).
describe("VD/VT (Bohr-Enghoff form, recalled)", () => {
  const test = makeTest(buildRows(() => ({ vco2MlMin: 1000, veLMin: 30 })));

  it("PaCO2 40 mmHg, VE/VCO2 30 → 1 − 863/1200 = 0.280833…", () => {
    const r = vdVt(test, [
      { timeS: 120, paCO2MmHg: 40, label: "rest" },
      { timeS: 700, paCO2MmHg: 35, label: "peak" },
    ]);
    expect(r.points).toHaveLength(2);
    expect(r.points[0].veVco2.value).toBeCloseTo(30, 9);
    expect(r.points[0].vdVt.value).toBeCloseTo(1 - 863 / 1200, 12);
    // 1 − 863/(35·30) = 1 − 863/1050 = 0.178095…
    expect(r.points[1].vdVt.value).toBeCloseTo(1 - 863 / 1050, 12);
    expect(r.points[1].vdVt.provenance.sourceIds).toEqual(["bohr-enghoff", "hansen-1984-limits"]);
  });

  it("samples without PaCO2 are skipped; non-positive PaCO2 raises a warning", () => {
    const r = vdVt(test, [
      { timeS: 100, paO2MmHg: 90 },
      { timeS: 200, paCO2MmHg: 0 },
    ]);
    expect(r.points).toHaveLength(1);
    expect(r.points[0].vdVt.value).toBeNull();
    expect(r.issues.filter((i) => i.severity !== "info").map((i) => i.code)).toEqual(["paco2-not-positive"]);
  });

  it("a sample outside the recorded breaths → no point, and a warning", () => {
    const r = vdVt(test, [{ timeS: 5000, paCO2MmHg: 40 }]);
    expect(r.points).toHaveLength(0);
    expect(r.issues.map((i) => i.code)).toContain("blood-gas-outside-recording");
  });

  // Bohr-Enghoff form with the apparatus term (recalled; ../shared clinical reference §VD/VT):
  // VD/VT = 1 − 863/(PaCO2 · VE/VCO2) − VDapparatus/VT
  it("apparatus dead space 100 mL at a tidal volume of 2 L (VE 30 L/min, 15 breaths/min) takes 0.05 off", () => {
    const withPattern = makeTest(buildRows(() => ({ vco2MlMin: 1000, veLMin: 30, rrBrMin: 15 })));
    const r = vdVt(withPattern, [{ timeS: 700, paCO2MmHg: 40, label: "peak" }], {}, 100);
    expect(r.points[0].vtL?.value).toBeCloseTo(2, 9);
    expect(r.points[0].vdVt.value).toBeCloseTo(1 - 863 / 1200 - 0.1 / 2, 12);
    expect(r.points[0].vdVt.provenance.inputs).toMatchObject({ apparatusDeadSpaceMl: 100, vtL: 2 });
    expect(r.points[0].vdVt.provenance.label).toMatch(/− VDapparatus\/VT; apparatus dead space 100 mL, VT 2.00 L/);
    expect(r.issues.map((i) => i.code)).not.toContain("vdvt-apparatus-dead-space");
  });

  it("a tidal-volume column is preferred to VE / respiratory rate", () => {
    const withVt = makeTest(buildRows(() => ({ vco2MlMin: 1000, veLMin: 30, rrBrMin: 15, vtL: 2.5 })));
    const r = vdVt(withVt, [{ timeS: 700, paCO2MmHg: 40, label: "peak" }], {}, 150);
    // 0.150 L / 2.5 L = 0.06
    expect(r.points[0].vdVt.value).toBeCloseTo(1 - 863 / 1200 - 0.06, 12);
  });

  it("a dead space with no tidal volume to divide by is not subtracted, and a warning says so", () => {
    const r = vdVt(test, [{ timeS: 700, paCO2MmHg: 40, label: "peak" }], {}, 100);
    expect(r.points[0].vdVt.value).toBeCloseTo(1 - 863 / 1200, 12);
    expect(r.points[0].vtL).toBeUndefined();
    expect(r.issues.find((i) => i.code === "vdvt-apparatus-not-subtracted")?.message).toMatch(/100 mL/);
  });

  it("no dead space entered: the value is unsubtracted and an info line says how to enter it", () => {
    const r = vdVt(test, [{ timeS: 700, paCO2MmHg: 40, label: "peak" }]);
    expect(r.issues.find((i) => i.code === "vdvt-apparatus-dead-space")?.message).toMatch(/Enter the apparatus dead space/);
  });

  // Alveolar gas equation, full form (common practice): PAO2 = FiO2·(PB − 47) − PaCO2·[FiO2 + (1 − FiO2)/R]
  it("P(A−a)O2 by construction: R 1.0, PaCO2 40, PaO2 90 → 0.2093·713 − 40 − 90 = 19.23 mmHg at sea level", () => {
    const withR = makeTest(buildRows(() => ({ vo2MlMin: 1000, vco2MlMin: 1000, veLMin: 30 })));
    const r = vdVt(withR, [{ timeS: 700, paCO2MmHg: 40, paO2MmHg: 90, label: "peak" }]);
    expect(r.points[0].aaGradient!.value).toBeCloseTo(0.2093 * 713 - 40 * (0.2093 + 0.7907 / 1) - 90, 9);
    expect(r.issues.map((i) => i.code)).toContain("aa-gradient-sea-level");
    // at 630 mmHg (about 1 500 m): 0.2093·583 − 40 − 90 = −7.98 mmHg; no sea-level note
    const high = vdVt(withR, [{ timeS: 700, paCO2MmHg: 40, paO2MmHg: 90, label: "peak" }], {}, undefined, 630);
    expect(high.points[0].aaGradient!.value).toBeCloseTo(0.2093 * 583 - 40 - 90, 9);
    expect(high.issues.map((i) => i.code)).not.toContain("aa-gradient-sea-level");
    // R 0.8 (VCO2 800, VO2 1000): 149.2309 − 40·(0.2093 + 0.7907/0.8) − 90 = 149.2309 − 47.907 − 90 = 11.32 mmHg
    const lowR = makeTest(buildRows(() => ({ vo2MlMin: 1000, vco2MlMin: 800, veLMin: 24 })));
    const r2 = vdVt(lowR, [{ timeS: 700, paCO2MmHg: 40, paO2MmHg: 90, label: "peak" }]);
    expect(r2.points[0].aaGradient!.value).toBeCloseTo(0.2093 * 713 - 40 * (0.2093 + 0.7907 / 0.8) - 90, 9);
    expect(r2.points[0].aaGradient!.value).toBeCloseTo(11.32, 2);
  });

  it("no PaO2: no P(A−a)O2", () => {
    const r = vdVt(test, [{ timeS: 700, paCO2MmHg: 40, label: "peak" }]);
    expect(r.points[0].aaGradient).toBeUndefined();
  });

  it("a dead space larger than the measured dead space (negative VD/VT) gives no VD/VT and a warning", () => {
    // VE 30 L/min at 15 breaths/min: VT 2 L; uncorrected VD/VT 0.2808 → dead space 0.56 L; 600 mL entered exceeds it
    const withPattern = makeTest(buildRows(() => ({ vco2MlMin: 1000, veLMin: 30, rrBrMin: 15 })));
    const r = vdVt(
      withPattern,
      [
        { timeS: 120, paCO2MmHg: 40, label: "rest" },
        { timeS: 700, paCO2MmHg: 40, label: "peak" },
      ],
      {},
      600,
    );
    expect(r.points.every((p) => p.vdVt.value === null)).toBe(true);
    expect(r.issues.find((i) => i.code === "vdvt-apparatus-too-large")?.message).toMatch(
      /600 mL\) is larger than the whole dead space/,
    );
  });
});
