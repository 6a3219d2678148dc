import { defineSources } from "../core/source";

/**
 * Sources of the ventilatory-threshold methods (VT1, VT2/RCP, consensus). Status follows the clinical
 * sheets' marks: C → confirmed, C2 → secondary, M → recalled. Ids are prefixed to stay apart from
 * THRESHOLD_SOURCES (lib/thresholds/sources.ts).
 */
export const VT_SOURCES = defineSources({
  "beaver-1986-v-slope": {
    citation:
      "Beaver WL, Wasserman K, Whipp BJ. A new method for detecting anaerobic threshold by gas exchange. J Appl Physiol 1986;60:2020-7",
    status: "confirmed",
    pmid: "3087938",
    note: "Abstract confirms: regression of the slopes of VCO2 vs VO2 detects the start of excess CO2; respiratory compensation found separately on VE vs VCO2 and lies higher. Exclusion of the first minute and data above RCP, and the acceptance rules S1 ≥ 0.6 and S2 − S1 ≥ 0.1, are recalled (not seen).",
  },
  "vt-v-slope-acceptance-recalled": {
    citation:
      "V-slope acceptance rules S1 ≥ 0.6 and S2 − S1 ≥ 0.1, attributed to Beaver, Wasserman & Whipp 1986 (recalled, not seen in found text)",
    status: "recalled",
  },
  "orr-1982-multisegment": {
    citation:
      "Orr GW, Green HJ, Hughson RL, Bennett GW. A computer linear regression model to determine ventilatory anaerobic threshold. J Appl Physiol 1982;52:1349",
    status: "confirmed",
    pmid: "7096157",
    note: "Multisegment linear regression, breakpoint at minimum pooled residual sum of squares (abstract).",
  },
  "vt-line-intersection": {
    citation:
      "Intersection of two fitted lines VO2 = (b2 − b1)/(m1 − m2) as the V-slope threshold (line algebra; described on a V-slope course page, secondary)",
    status: "secondary",
  },
  "sue-1988-modified-v-slope": {
    citation:
      "Sue DY, Wasserman K, Moricca RB, Casaburi R. Metabolic acidosis during exercise in patients with chronic obstructive pulmonary disease: use of the V-slope method for anaerobic threshold determination. Chest 1988;94:931-8",
    status: "confirmed",
    note: "Line of slope 1 through the lower VCO2-VO2 points; threshold where VCO2 departs above it (excess CO2). Title and author list partly recalled.",
  },
  "vt-equivalents-criteria": {
    citation:
      "VT1 where VE/VO2 and PETO2 begin a systematic rise while VE/VCO2 and PETCO2 stay flat (common practice; criteria seen in a published method description, secondary)",
    status: "secondary",
  },
  "vt-rcp-criteria-recalled": {
    citation:
      "RCP where VE/VCO2 rises after its nadir and PETCO2 starts to fall; equivalently the breakpoint of VE vs VCO2 (common practice, recalled)",
    status: "recalled",
  },
  "vt-two-methods-agree-recalled": {
    citation: "Report the anaerobic threshold only when at least two methods agree (common practice, recalled)",
    status: "recalled",
  },
  "dolezal-2017-multi-plot": {
    citation:
      "Dolezal BA et al. Concurrent validity of ventilatory threshold methods / systematic multi-plot approach. J Sports Sci Med 2017 (PMC5592292)",
    status: "confirmed",
    note: "Advocates a systematic approach using several plots; individual steps recalled.",
  },
  "vt-outlier-4sd": {
    citation:
      "Breath outliers beyond ±4 SD (or ±3 SD) of a local reference: later convention counted in a scoping review of breath-by-breath studies (Thieme, doi 10.1055/a-2495-5364)",
    status: "confirmed",
    note: "±4 SD used by 51.6 % of studies that describe outlier removal; the local running median of 9 breaths is our choice.",
  },
  "vt-joint-profile-choice": {
    citation:
      "Joint profile likelihood of one break time shared by several signals against time (VT1: excess CO2 over the whole ramp, VE and PETO2 below the RCP, each a straight hinge or, when that fits better by more than 4 log-likelihood units, a rise that steepens above the break; VT2: VE against VCO2, which may depart from its line as an exponential in time, and PETCO2), and its combination with the single-plot methods (implementation choice of this software, no published source)",
    status: "our-choice",
  },
  "hughson-1987-lactate-continuous": {
    citation:
      "Hughson RL, Weisiger KH, Swanson GD. Blood lactate concentration increases as a continuous function in progressive exercise. J Appl Physiol 1987;62(5):1975-81",
    status: "confirmed",
    note: "Abstract read: a continuous exponential-plus-constant model of lactate against VO2 fitted 21 of 23 ramp tests better than a threshold model. Basis for letting the joint VT1 profile fit a rise that steepens above the break, and the VT2 profile an exponential departure of VE from its line in VCO2 (the compensation follows the acidosis: recalled physiology).",
  },
  "beaver-1985-log-log": {
    citation:
      "Beaver WL, Wasserman K, Whipp BJ. Improved detection of lactate threshold during exercise using a log-log transformation. J Appl Physiol 1985;59:1936-40",
    status: "secondary",
    note: "Cited in the abstract of Hughson et al. 1987: the threshold model that the continuous model was compared with.",
  },
  "vt-implementation-choice": {
    citation:
      "Implementation choice of this software for ventilatory thresholds (no published source): bin length, lead-in exclusion, agreement tolerance, F-statistic floor, resampling",
    status: "our-choice",
  },
});
