import { defineSources } from "../core/source";

/**
 * Sources for the conditioning layer (artefact rejection, averaging, phases). Status marks follow the
 * project's clinical sheets (C = confirmed, C2 = secondary, M = recalled).
 */
export const SIGNAL_SOURCES = defineSources({
  "acsm-metabolic-equations": {
    citation:
      "ACSM's Guidelines for Exercise Testing and Prescription, 10th ed., Table 6.3 metabolic calculations, as reproduced by Bushman BA. Metabolic calculations in action part 2. ACSM Health Fit J 2020;24(4):5-8",
    status: "secondary",
    doi: "10.1249/FIT.0000000000000577",
    note: "Walking VO2 = 3.5 + 0.1·S + 1.8·S·G (mL/kg/min, S in m/min, G grade as a fraction), seen in the reproduction. Used as a treadmill load index to find the phases of files without markers.",
  },
  "outlier-scoping-review-2025": {
    citation:
      "Scoping review of outlier handling in breath-by-breath gas-exchange studies (Thieme journal), doi 10.1055/a-2495-5364",
    status: "confirmed",
    doi: "10.1055/a-2495-5364",
    note: "Of 8,344 breath-by-breath articles only 376 (4.5%) described outlier removal; cut-offs ±4 SD 51.6%, ±3 SD 39.1%; 1-s linear interpolation 93.9%/92.5%; bin averages 30 s 30.9%, 60 s 12.4%, 15 s 11.6%, 10 s 11.0%, 20 s 8.1%. Journal name, year and authors not seen.",
  },
  "lamarra-1987": {
    citation:
      "Lamarra N, Whipp BJ, Ward SA, Wasserman K. Effect of interbreath fluctuations on characterizing exercise gas exchange kinetics. J Appl Physiol 1987 (62:2003, volume/page recalled)",
    status: "confirmed",
    note: "Abstract seen: breath-to-breath noise behaved as uncorrelated Gaussian with SD largely independent of metabolic rate. The abstract proposes NO outlier-deletion rule; the local mean ± k·SD rule is later convention.",
  },
  "liang-1996": {
    citation: "Liang PJ, Pandit JJ, Robbins PA. J Appl Physiol 1996;81:2274",
    status: "confirmed",
    note: "Breath-to-breath ventilation was autocorrelated (1 of 60 series white): a mean ± k·SD window assumes independent breaths, so treat the rule as a screen, not a test.",
  },
  "martin-rincon-2020": {
    citation:
      "Martin-Rincon M, Calbet JAL. Progress update and challenges on VO2max testing and interpretation. Front Physiol 2020 (PMC7494971)",
    status: "confirmed",
    note: "Averaging choice shifts VO2max by 4–10%; 15–20 breaths or seconds recommended as a compromise.",
  },
  "vo2max-averaging-2023": {
    citation: "Sports Med 2023, doi 10.1007/s40279-023-01903-3 (VO2max determination: averaging)",
    status: "confirmed",
    doi: "10.1007/s40279-023-01903-3",
    note: "Binned averages 'not advisable' for VO2max; use a digital filter or a 30-s moving average.",
  },
});
