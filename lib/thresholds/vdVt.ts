import type { BloodGasSample } from "../breath";
import { makeIssue, measured, notDetermined, type Issue, type Measured } from "../core";
import type { ConditionedTest } from "../signal";
import { provenanceOf } from "./indexSeries";
import { readAtTime, type ReadAtTimeOptions } from "./valuesAtThreshold";

/** Constant of the Bohr-Enghoff form with VE at BTPS and VCO2 at STPD (recalled): VD/VT = 1 − 863/(PaCO2·VE/VCO2). */
export const BOHR_ENGHOFF_CONSTANT = 863;

export interface VdVtPoint {
  timeS: number;
  label?: string;
  paCO2MmHg: number;
  veVco2: Measured;
  vdVt: Measured;
}

/**
 * Dead-space fraction VD/VT at each blood-gas time point with PaCO2, by the Bohr-Enghoff form
 * VD/VT = 1 − 863/(PaCO2 · VE/VCO2) with VE at BTPS and VCO2 at STPD (form recalled; no apparatus dead space
 * subtracted). VE/VCO2 is read at the sample time (see `readAtTime`). Normal peak < 0.28 (Hansen 1984, confirmed).
 *
 * @example PaCO2 40 mmHg, VE/VCO2 30 → 1 − 863/1200 = 0.2808
 */
export function vdVt(
  test: ConditionedTest,
  gases: readonly BloodGasSample[] | undefined,
  options: ReadAtTimeOptions = {},
): { points: VdVtPoint[]; issues: Issue[] } {
  const issues: Issue[] = [];
  const points: VdVtPoint[] = [];
  for (const g of gases ?? []) {
    if (g.paCO2MmHg === undefined) continue;
    const veVco2 = readAtTime(test, "veLMin", g.timeS, "1", { ...options, denominator: "vco2MlMin", scale: 1000 });
    const prov = provenanceOf("vd-vt-bohr-enghoff", "VD/VT = 1 − 863/(PaCO2 · VE/VCO2)", ["bohr-enghoff", "hansen-1984"], {
      window: veVco2.provenance.window,
      inputs: { paCO2MmHg: g.paCO2MmHg, veVco2: veVco2.value, constant: BOHR_ENGHOFF_CONSTANT },
    });
    let v: Measured;
    if (!(g.paCO2MmHg > 0)) {
      v = notDetermined("1", prov, "PaCO2 is not positive");
      issues.push(
        makeIssue("warning", "paco2-not-positive", "A blood gas has a PaCO2 that is not positive; VD/VT skipped.", {
          timeS: g.timeS,
        }),
      );
    } else if (veVco2.value === null) v = notDetermined("1", prov, veVco2.reason ?? "VE/VCO2 not available at the sample time");
    else v = measured(1 - BOHR_ENGHOFF_CONSTANT / (g.paCO2MmHg * veVco2.value), "1", prov);
    points.push({ timeS: g.timeS, label: g.label, paCO2MmHg: g.paCO2MmHg, veVco2, vdVt: v });
  }
  return { points, issues };
}
