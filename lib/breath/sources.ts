import { defineSources } from "../core/source";

/**
 * Sources for the import layer's plausibility checks. Status marks follow the project's clinical sheets
 * (C = confirmed, C2 = secondary, M = recalled). The ERS 2019 protocol statement is registered in
 * `lib/core/sources.ts` as `radtke-2019`.
 */
export const BREATH_SOURCES = defineSources({
  "physiological-plausibility": {
    citation:
      "Physiological plausibility limits for exercise-test values (common practice; no single published source): peak VO2 above ~7000 mL/min or ~90 mL/kg/min, VE above ~300 L/min, HR above 230 or below 25 beats/min are not expected in a clinical test",
    status: "common-practice",
    note: "Screens for unit slips and column mix-ups. The highest peak VO2 values reported in elite endurance athletes lie in the high 80s to low 90s mL/kg/min (recalled); HR 230 lies above 220 − age for any age tested (Fox formula, confirmed in lib/thresholds/sources.ts as fox-hrmax).",
  },
});
