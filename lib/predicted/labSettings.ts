import { z } from "zod";
import { makeIssue, type Ergometer, type Issue } from "../core";
import { findEquation } from "./equations";
import { LAB_QUANTITIES, sameConcept, type LabQuantity } from "./quantities";

/**
 * A lab's choice of reference equation per predicted quantity and ergometer. Settings are data:
 * they are stored with each analysis version, so a report can be reproduced exactly.
 */
export interface LabSettings {
  equations: Partial<Record<LabQuantity, Partial<Record<Ergometer, string>>>>;
}

export const LabSettingsSchema = z.strictObject({
  equations: z.partialRecord(
    z.enum(LAB_QUANTITIES),
    z.strictObject({ cycle: z.string().optional(), treadmill: z.string().optional() }),
  ),
});

/**
 * Defaults (our choice, documented):
 * - peak VO2, cycle: `hansen-1984` (Hansen, Sue & Wasserman 1984 with the Wasserman weight rules) —
 *   the set most used for clinical cycle CPET, covers both sexes, and its weight rules keep obese
 *   patients from getting an inflated prediction. FRIEND 2018's cycle term is far smaller than the
 *   measured cycle–treadmill difference (clinical-reference §7 item 4), so it over-predicts on a cycle.
 * - peak VO2, treadmill: `friend-2018` (de Souza e Silva 2018) — coefficients confirmed in the primary
 *   abstract (FRIEND 2017's only in a reproduction), derived from a large healthy treadmill-and-cycle
 *   cohort aged 20–85, uses height as well as weight, and its SEE gives an LLN.
 * - maximal work rate, cycle: `jones-1985-wmax` (the only confirmed work-rate set; treadmill has none).
 * - maximal heart rate: ERS 2019 Table 3 rows (`ers-2019-hrmax-cycle`, `ers-2019-hrmax-treadmill`) —
 *   confirmed, ergometer-specific, listed by the ERS statement.
 * - maximal O2 pulse: `o2pulse-derived` (the chosen peak VO2 ÷ the chosen HRmax), so the three
 *   predictions shown in one report are consistent; `jones-1985-o2pulse` is the confirmed direct set.
 * - lowest VE/VCO2: `sun-2002` (the only set; valid for both ergometers).
 * - MVV: `mvv-fev1x40` (recalled convention; ×35 available); a measured MVV should be preferred.
 */
export const DEFAULT_LAB_SETTINGS: LabSettings = Object.freeze({
  equations: Object.freeze({
    vo2PeakMlMin: { cycle: "hansen-1984", treadmill: "friend-2018" },
    workMaxW: { cycle: "jones-1985-wmax" },
    hrMaxBpm: { cycle: "ers-2019-hrmax-cycle", treadmill: "ers-2019-hrmax-treadmill" },
    o2PulseMaxMlBeat: { cycle: "o2pulse-derived", treadmill: "o2pulse-derived" },
    veVco2NadirRatio: { cycle: "sun-2002", treadmill: "sun-2002" },
    mvvLMin: { cycle: "mvv-fev1x40", treadmill: "mvv-fev1x40" },
  }),
});

export interface ResolvedEquationId {
  /** Equation to use, or undefined when none applies (e.g. work rate on a treadmill). */
  equationId?: string;
  issues: Issue[];
}

/**
 * Which equation a lab uses for `quantity` on `ergometer`. A lab choice that names an unknown
 * equation, a performance estimate (never a predicted normal) or an equation for another quantity
 * is refused with a warning and the default is used instead.
 */
export function resolveEquationId(
  quantity: LabQuantity,
  ergometer: Ergometer,
  settings: LabSettings = DEFAULT_LAB_SETTINGS,
): ResolvedEquationId {
  const fallback = DEFAULT_LAB_SETTINGS.equations[quantity]?.[ergometer];
  const chosen = settings.equations[quantity]?.[ergometer];
  if (chosen === undefined || chosen === fallback) return { equationId: fallback, issues: [] };
  const eq = findEquation(chosen);
  let problem: string | undefined;
  if (!eq) problem = `no reference equation has the id "${chosen}"`;
  else if (eq.kind === "performance-estimate")
    problem = `"${chosen}" estimates VO2 from the work rate achieved and is not a predicted normal`;
  else if (!sameConcept(eq.quantity, quantity)) problem = `"${chosen}" predicts ${eq.quantity}, not ${quantity}`;
  if (problem) {
    return {
      equationId: fallback,
      issues: [
        makeIssue(
          "warning",
          "lab-equation-refused",
          `Lab setting for ${quantity} (${ergometer}) refused: ${problem}. Using ${fallback ?? "no equation"} instead.`,
          { field: `labSettings.equations.${quantity}.${ergometer}` },
        ),
      ],
    };
  }
  return { equationId: chosen, issues: [] };
}
