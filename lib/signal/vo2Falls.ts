import { makeIssue, type Issue } from "../core";
import type { BreathRow } from "../breath";
import { robustSd, runningMedian } from "../numeric";
import { formatClock } from "../units";
import { treadmillLoad } from "./detectPhases";

/**
 * A fall of VO2 during incremental exercise. In an incremental test VO2 rises with the work rate (about 10 mL/min per W
 * on a cycle ramp: 10.29 ± 1.01 mL/min/W in normal men, Hansen 1987, Am J Cardiol 59:669 — confirmed): a sustained fall while the load holds
 * or rises is either a finding (oscillatory ventilation with long cycles; myocardial ischaemia or left-ventricular
 * dysfunction, with a falling O2 pulse) or a fault (a mask or sampling-line leak, a gas-analyser fault, a pause in
 * pedalling or walking, holding the treadmill's handrails) — common practice. The warning names both and asks for a
 * check; it never removes data. It cannot see a stop in the last minute (the 60-s window and the 10-s end gap). Found on real recordings: ACTES test 4 (60-s VO2 1 693 → 1 345
 * mL/min at 200-215 W), 7 and 14 (open data, ODC-By 1.0).
 */
export interface Vo2Fall {
  /** End of the 60-s window with the highest VO2 before the fall, s. */
  highS: number;
  /** End of the lowest 60-s window after it, s. */
  lowS: number;
  highMlMin: number;
  lowMlMin: number;
  /** (high − low) / high. */
  fraction: number;
  /** The fall in standard errors of a 60-s mean (breath noise from the scatter about a 9-breath running median). */
  z: number;
}

/** Width of the rolling VO2 mean the fall is measured on, s (our choice: longer than a breath cluster, shorter than a stage). */
export const VO2_FALL_WINDOW_S = 60;
/**
 * A fall is reported when the 60-s mean drops at least this fraction below its highest earlier value in exercise … (our
 * choice). Measured with `VO2_FALL_MIN_Z`: said on 11 of 2 160 invented tests without a fall built in (six synthetic
 * models × low, moderate and high breath noise × 120 tests: 2, 1 and 8 at the three levels; 15 % and 12 SE would say it
 * on about 2) and on 3 of 18 ACTES tests (4, 7 and 14, each a visible fall at a held or rising load).
 */
export const VO2_FALL_MIN_FRACTION = 0.1;
/** … and by at least this many standard errors of a 60-s mean (our choice; see `VO2_FALL_MIN_FRACTION`). */
export const VO2_FALL_MIN_Z = 10;
/** The first two minutes of exercise (60 s after the window fills) are not read: VO2 is still settling after the load starts (our choice). */
const SETTLE_S = 60;
/** The last seconds of exercise are not read: the end of exercise is placed to within a breath or two (our choice). */
const END_GAP_S = 10;

/**
 * The largest fall of the 60-s rolling VO2 mean below its highest earlier value within the exercise phase, when it is at
 * least `VO2_FALL_MIN_FRACTION` and `VO2_FALL_MIN_Z` standard errors, and the load (work rate, else the treadmill's
 * walking cost of speed and grade, else grade) at the low point is not below the load at the high point; null otherwise. One pass with a moving window: O(n), plus
 * the running median for the breath noise.
 *
 * @param rows clean breaths (artefacts removed), time order
 * @param exercise the incremental exercise phase
 */
export function findVo2Fall(rows: readonly BreathRow[], exercise: { startS: number; endS: number }): Vo2Fall | null {
  const ex = rows.filter((r) => r.timeS >= exercise.startS && r.timeS <= exercise.endS && typeof r.vo2MlMin === "number");
  if (ex.length < 20) return null;
  const vo2 = ex.map((r) => r.vo2MlMin!);
  const med = runningMedian(vo2, 4);
  const sdBreath = robustSd(
    vo2.map((v, i) => v - med[i]),
    0,
  );
  if (!(sdBreath > 0)) return null;
  // the load: the work rate, or on a treadmill the ACSM walking cost of speed and grade together (so a protocol that
  // trades speed for grade is read by its cost), or the grade alone
  const load = (r: BreathRow) =>
    r.workW ?? (r.speedKmh !== undefined ? treadmillLoad(r.speedKmh, r.gradePct) : (r.gradePct ?? null));
  let best: Vo2Fall | null = null;
  let high = -Infinity;
  let highAt = 0;
  let highLoad: number | null = null;
  let j = 0;
  let sum = 0;
  for (let i = 0; i < ex.length; i++) {
    sum += vo2[i];
    while (ex[j].timeS < ex[i].timeS - VO2_FALL_WINDOW_S) sum -= vo2[j++];
    const t = ex[i].timeS;
    if (t - exercise.startS < VO2_FALL_WINDOW_S + SETTLE_S || exercise.endS - t < END_GAP_S) continue;
    const n = i - j + 1;
    const mean = sum / n;
    if (mean > high) {
      high = mean;
      highAt = t;
      highLoad = load(ex[i]);
      continue;
    }
    const fraction = (high - mean) / high;
    const z = (high - mean) / (sdBreath / Math.sqrt(n));
    const loadNow = load(ex[i]);
    const loadHeld = highLoad === null || loadNow === null || loadNow >= highLoad - 1e-9;
    if (fraction >= VO2_FALL_MIN_FRACTION && z >= VO2_FALL_MIN_Z && loadHeld && (!best || fraction > best.fraction))
      best = { highS: highAt, lowS: t, highMlMin: high, lowMlMin: mean, fraction, z };
  }
  return best;
}

/** The warning for a fall (`vo2-falls-in-exercise`), with its times and values. */
export function vo2FallIssue(fall: Vo2Fall): Issue {
  const pct = Math.round(100 * fall.fraction);
  return makeIssue(
    "warning",
    "vo2-falls-in-exercise",
    `VO2 fell by ${pct} % during exercise while the load did not fall: its ${VO2_FALL_WINDOW_S}-s mean went from ${Math.round(fall.highMlMin)} mL/min (window ending ${formatClock(fall.highS)}) to ${Math.round(fall.lowMlMin)} mL/min (ending ${formatClock(fall.lowS)}). Physiology can do this: oscillatory ventilation with long cycles, or myocardial ischaemia or left-ventricular dysfunction (look at the ECG, blood pressure, heart rate and O2 pulse over the same time). So can a fault: a mask or sampling-line leak, a gas-analyser fault, a pause in pedalling or walking, or holding the treadmill's handrails. Set those breaths aside only when a fault is confirmed (test log; VE and VCO2 falling with VO2). Values read across that time (VT1, VT2, the slopes, ΔVO2/ΔWR, peak VO2) may not describe the patient, and the fall is not read as a VO2 plateau.`,
    { field: "vo2MlMin", timeS: fall.lowS },
  );
}
