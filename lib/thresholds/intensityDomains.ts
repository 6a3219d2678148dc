import { makeIssue, measured, notDetermined, type Issue, type Measured } from "../core";
import type { PeakValues } from "./measurePeaks";
import type { RampLag } from "./rampLag";
import type { ValuesAtThreshold } from "./valuesAtThreshold";

export type DomainId = "moderate" | "heavy" | "severe";

/** The lag when none was measured (no ramp given to the domains). */
const NO_LAG = notDetermined(
  "s",
  { method: "ramp-vo2-lag", label: "VO2 lag on the ramp", sourceIds: ["whipp-1981-ramp"] },
  "not measured",
);

/** Issue code when no domain is given because VT2 does not lie above VT1. */
export const DOMAINS_OUT_OF_ORDER = "domains-thresholds-out-of-order";

/** A range on one variable; a null bound means open (below VT1 / up to peak not determinable). */
export interface DomainRange {
  lower: Measured | null;
  upper: Measured | null;
}

export interface IntensityDomain {
  id: DomainId;
  label: string;
  hrBpm: DomainRange;
  workW: DomainRange;
  /**
   * The work rate a patient can hold at the same intensity: the ramp's work rate one VO2 lag earlier (`RampLag`); null
   * bounds where the lag is not known, and the severe domain's top (a peak is not held at constant load).
   */
  workConstantLoadW: DomainRange;
  speedKmh: DomainRange;
  /** Treadmill grade over the same range, % (the speed is prescribed with its grade). */
  gradePct: DomainRange;
}

export interface IntensityDomainsResult {
  domains: IntensityDomain[];
  /** The VO2 lag on the ramp the constant-load work rates are read with. */
  lag: RampLag["lagS"];
  sourceIds: string[];
  issues: Issue[];
}

/**
 * Exercise-intensity domains for prescription (common practice in exercise physiology): moderate below VT1,
 * heavy from VT1 to VT2, severe above VT2 (up to the peak values). Each domain gives its HR, work-rate,
 * speed and grade range from the values at VT1/VT2 and the peaks. Without VT1 or VT2 the domains that need it are
 * left out, with an issue; with VT2 not above VT1 none is given, with a warning.
 */
export function intensityDomains(
  atVt1: ValuesAtThreshold | null,
  atVt2: ValuesAtThreshold | null,
  peaks: PeakValues,
  lag: RampLag | null = null,
): IntensityDomainsResult {
  const issues: Issue[] = [];
  const domains: IntensityDomain[] = [];
  const usable = (m: Measured | undefined | null) => (m && m.value !== null ? m : null);
  const lagS = lag?.lagS.value ?? null;
  const shift = lagS !== null && lag?.rampWPerS ? lagS * lag.rampWPerS : null;
  // the ramp's work rate one VO2 lag earlier: what VO2 at the threshold reflects (Whipp et al. 1981; see `RampLag`)
  const held = (m: Measured | undefined | null): Measured | null => {
    const w = usable(m);
    if (!w || shift === null || !lag) return null;
    return measured(Math.max(0, w.value! - shift), "W", {
      ...lag.lagS.provenance,
      label: `work rate at constant load: the ramp's work rate ${Math.round(lagS!)} s (the VO2 lag) before the threshold`,
      sourceIds: [...lag.lagS.provenance.sourceIds, "intensity-domains"],
      inputs: { ...lag.lagS.provenance.inputs, rampW: w.value!, shiftW: shift },
    });
  };
  // the RCP follows the AT (common practice): with VT2 at or below VT1 (or before it in time) one of them is wrong, and
  // ranges read between them would run backwards ("VT1 to VT2: 102–95 bpm"); no prescription is drawn from them
  const v1 = atVt1?.vo2MlMin.value ?? null;
  const v2 = atVt2?.vo2MlMin.value ?? null;
  const t1 = atVt1?.timeS.value ?? null;
  const t2 = atVt2?.timeS.value ?? null;
  if ((v1 !== null && v2 !== null && v2 <= v1) || (t1 !== null && t2 !== null && t2 <= t1)) {
    issues.push(
      makeIssue(
        "warning",
        DOMAINS_OUT_OF_ORDER,
        "Intensity domains are not given: VT2 does not lie above VT1 (in VO2 or in time), so at least one of them is wrong. Review both thresholds; the domains follow once they are in order.",
      ),
    );
    return { domains, lag: lag?.lagS ?? NO_LAG, sourceIds: ["intensity-domains"], issues };
  }
  if (atVt1) {
    domains.push({
      id: "moderate",
      label: "moderate (below VT1)",
      hrBpm: { lower: null, upper: usable(atVt1.hrBpm) },
      workW: { lower: null, upper: usable(atVt1.workW) },
      workConstantLoadW: { lower: null, upper: held(atVt1.workW) },
      speedKmh: { lower: null, upper: usable(atVt1.speedKmh) },
      gradePct: { lower: null, upper: usable(atVt1.gradePct) },
    });
  }
  if (atVt1 && atVt2) {
    domains.push({
      id: "heavy",
      label: "heavy (VT1 to VT2)",
      hrBpm: { lower: usable(atVt1.hrBpm), upper: usable(atVt2.hrBpm) },
      workW: { lower: usable(atVt1.workW), upper: usable(atVt2.workW) },
      workConstantLoadW: { lower: held(atVt1.workW), upper: held(atVt2.workW) },
      speedKmh: { lower: usable(atVt1.speedKmh), upper: usable(atVt2.speedKmh) },
      gradePct: { lower: usable(atVt1.gradePct), upper: usable(atVt2.gradePct) },
    });
  }
  if (atVt2) {
    domains.push({
      id: "severe",
      label: "severe (above VT2)",
      hrBpm: { lower: usable(atVt2.hrBpm), upper: usable(peaks.hrBpm) },
      workW: { lower: usable(atVt2.workW), upper: usable(peaks.workW) },
      workConstantLoadW: { lower: held(atVt2.workW), upper: null },
      speedKmh: { lower: usable(atVt2.speedKmh), upper: usable(peaks.speedKmh) },
      gradePct: { lower: usable(atVt2.gradePct), upper: usable(peaks.gradePct) },
    });
  }
  if (!atVt1 || !atVt2) {
    issues.push(
      makeIssue(
        "info",
        "domains-incomplete",
        `Intensity domains need both thresholds; ${!atVt1 && !atVt2 ? "VT1 and VT2 are" : !atVt1 ? "VT1 is" : "VT2 is"} not available.`,
      ),
    );
  }
  if (domains.length > 0 && (atVt1?.workW.value ?? atVt2?.workW.value) != null) {
    issues.push(
      makeIssue(
        "info",
        "ramp-work-rates",
        shift !== null
          ? `Work rates at the thresholds are read from the ramp. VO2 lagged this ramp by about ${Math.round(lagS!)} s, so the work rate held at constant load for the same intensity is about ${Math.round(shift)} W lower; both are given.`
          : `Work rates at the thresholds are read from the ramp; VO2 lags a ramp, so constant-load training at these work rates sits at a higher intensity than the threshold itself. The lag could not be measured on this test (${lag?.lagS.reason ?? "not a cycle ramp"}).`,
      ),
    );
  }
  return { domains, lag: lag?.lagS ?? NO_LAG, sourceIds: ["intensity-domains"], issues };
}
