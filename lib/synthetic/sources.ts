import { defineSources } from "../core/source";

/**
 * Sources behind the synthetic test generator's default physiology. The generator's output is invented
 * data; these sources only say where its typical values come from.
 */
export const SYNTHETIC_SOURCES = defineSources({
  "hansen-1987-ramp-gain": {
    citation:
      "Hansen JE et al. Relation of oxygen uptake to work rate in normal men and men with circulatory disorders. Am J Cardiol 1987;59:669-74",
    status: "confirmed",
    pmid: "3825911",
    note: "ΔVO2/ΔWR 10.29 ± 1.01 mL/min/W in normal men; 8.29 ± 1.17 in many with circulatory disorders (abstract). Author list recalled.",
  },
  "beaver-1986-v-slope-model": {
    citation:
      "Beaver WL, Wasserman K, Whipp BJ. A new method for detecting anaerobic threshold by gas exchange. J Appl Physiol 1986;60:2020-7",
    status: "confirmed",
    pmid: "3087938",
    note: "Excess CO2 from bicarbonate buffering above the AT steepens VCO2 vs VO2; respiratory compensation on VE vs VCO2 lies higher (abstract). Slope values S1 ≈ 1, S2 > S1 are recalled.",
  },
  "lamarra-1987-noise": {
    citation:
      "Lamarra N, Whipp BJ, Ward SA, Wasserman K. Effect of interbreath fluctuations on characterizing exercise gas exchange kinetics. J Appl Physiol 1987",
    status: "confirmed",
    note: "Breath noise roughly Gaussian with SD largely independent of metabolic rate (abstract). Volume/page 62:2003 recalled.",
  },
  "liang-1996-autocorrelation": {
    citation:
      "Liang PJ, Pandit JJ, Robbins PA. Statistical properties of breath-to-breath variations in ventilation at constant PETCO2 and PETO2 in humans. J Appl Physiol 1996;81:2274",
    status: "confirmed",
    note: "Breath-to-breath ventilation is autocorrelated (abstract); title recalled.",
  },
  "alveolar-ventilation-equation": {
    citation:
      "Alveolar ventilation equation PACO2 = 863·VCO2/VA and alveolar gas equation PAO2 = PIO2 − PACO2·(FIO2 + (1 − FIO2)/R) (respiratory physiology textbooks)",
    status: "common-practice",
    note: "Used to derive end-tidal gases from VE, VCO2, dead-space fraction and R.",
  },
  "eov-criteria-review": {
    citation:
      "Exercise oscillatory ventilation criteria table (Kremser 1987, Corrà 2002-2006, Leite 2003, Ben-Dov 1992, Sun 2010), Cardiology Research 2025;16(6):475",
    status: "secondary",
    note: "Cycle length 30-140 s and amplitudes of 15-30 % of mean VE across definitions.",
  },
  "radtke-2019-protocol": {
    citation: "Radtke T et al. ERS statement on standardisation of CPET in chronic lung disease. Eur Respir Rev 2019;28:180101",
    status: "confirmed",
    note: "≥3 min rest, 3 min unloaded, 8-12 min incremental phase, ≥2-3 min recovery (abstract).",
  },
  "synthetic-invented": {
    citation:
      "Invented values of the cpet-desk synthetic generator (no published source; plausible physiology chosen by the authors)",
    status: "common-practice",
    note: "Every preset and noise level is invented data for tests and demonstrations.",
  },
});
