import { describe, it, expect } from "vitest";
import { measured, notDetermined } from "../../lib/core";
import { breathingReserve } from "../../lib/thresholds/breathingReserve";

const ve = (v: number) => measured(v, "L/min", { method: "test", label: "peak VE", sourceIds: [] });

// MVV estimates (lib source ids in brackets): FEV1 × 40, attributed to Campbell 1982 — recalled ["mvv-fev1x40"];
// FEV1 × 35, attributed to Gandevia & Hugh-Jones 1957 — recalled attribution, used in practice per a secondary source
// (attribution recalled ["mvv-fev1x35"], practice secondary ["mvv-fev1x35-practice"]); Otto-Yáñez M et al., Front Physiol 2020;11:537 compared the multipliers and
// advised against estimating MVV — confirmed ["otto-yanez-2020"]. BR = MVV − VEpeak and BR% = 100·(1 − VEpeak/MVV):
// definition, recalled ["breathing-reserve-definition"].
describe("breathing reserve", () => {
  it("FEV1 3.2 L → MVV 3.2·40 = 128 (×40, recalled) or 3.2·35 = 112 (×35, secondary) L/min (clinical-reference §2 worked example)", () => {
    expect(breathingReserve(ve(100), { fev1L: 3.2 }, { mvvChoice: "fev1x40" }).mvvLMin.value).toBeCloseTo(128, 9);
    const r35 = breathingReserve(ve(100), { fev1L: 3.2 }, { mvvChoice: "fev1x35" });
    expect(r35.mvvLMin.value).toBeCloseTo(112, 9);
    expect(r35.mvvLMin.provenance.sourceIds).toEqual(["mvv-fev1x35", "mvv-fev1x35-practice", "otto-yanez-2020"]);
  });

  it("BR, BR% and VE/MVV by hand: MVV 128, VE 100 → 128 − 100 = 28 L/min, 100·28/128 = 21.875%, 100·100/128 = 78.125%", () => {
    const r = breathingReserve(ve(100), { fev1L: 3.2 }, { mvvChoice: "fev1x40" });
    expect(r.reserveLMin.value).toBeCloseTo(28, 9);
    expect(r.reservePercent.value).toBeCloseTo(21.875, 9);
    expect(r.veMvvPercent.value).toBeCloseTo(78.125, 9);
  });

  it("default: measured MVV when present; else FEV1 × 40 with an info issue; else not determinable", () => {
    const m = breathingReserve(ve(100), { fev1L: 3.2, mvvLMin: 150 });
    expect(m.mvvChoice).toBe("measured");
    expect(m.mvvLMin.value).toBe(150);
    expect(m.issues).toHaveLength(0);
    const e = breathingReserve(ve(100), { fev1L: 3.2 });
    expect(e.mvvChoice).toBe("fev1x40");
    expect(e.issues.map((i) => i.code)).toEqual(["mvv-estimated"]);
    const none = breathingReserve(ve(100), undefined);
    expect(none.veMvvPercent.value).toBeNull();
    expect(none.veMvvPercent.reason).toMatch(/no spirometry/);
  });

  it("peak VE not determinable → BR not determinable with its reason", () => {
    const r = breathingReserve(notDetermined("L/min", { method: "x", label: "x", sourceIds: [] }, "no VE column"), {
      mvvLMin: 120,
    });
    expect(r.reserveLMin.value).toBeNull();
    expect(r.reserveLMin.reason).toBe("no VE column");
  });
});

describe("spirometry that cannot be right (invented values)", () => {
  it("peak VE 90 L/min against an MVV of 48 (FEV1 1.2 L × 40): VE/MVV 188 %, a warning to check the spirometry", () => {
    const r = breathingReserve(ve(90), { fev1L: 1.2 });
    expect(r.veMvvPercent.value).toBeCloseTo(187.5, 9);
    expect(r.issues.map((i) => [i.severity, i.code])).toContainEqual(["warning", "ve-mvv-implausible"]);
    // 110 % is unusual but seen in severe COPD: no warning
    expect(breathingReserve(ve(52.8), { fev1L: 1.2 }).issues.map((i) => i.code)).not.toContain("ve-mvv-implausible");
  });

  it("measured MVV 160 L/min with FEV1 1.2 L (133 ×): a warning; 130 L/min with FEV1 3.4 L (38 ×): none", () => {
    const odd = breathingReserve(ve(90), { fev1L: 1.2, mvvLMin: 160 });
    expect(odd.issues.find((i) => i.code === "mvv-fev1-implausible")?.message).toMatch(/is 133 × FEV1 \(1\.20 L\)/);
    expect(breathingReserve(ve(90), { fev1L: 3.4, mvvLMin: 130 }).issues.map((i) => i.code)).not.toContain(
      "mvv-fev1-implausible",
    );
  });
});
