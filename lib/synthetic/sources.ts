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
    status: "our-choice",
    note: "Every preset and noise level is invented data for tests and demonstrations.",
  },
  "beaver-1986-buffering": {
    citation:
      "Beaver WL, Wasserman K, Whipp BJ. A new method for detecting anaerobic threshold by gas exchange. J Appl Physiol 1986;60:2020-7",
    status: "confirmed",
    pmid: "3087938",
    note: "Hold-out model: excess CO2 from bicarbonate buffering ≈22 mL CO2 per mEq of lactic acid (abstract, via clinical-confirmations §4). The effective buffering volume the hold-out model multiplies it by is invented.",
  },
  "whipp-1982-kinetics": {
    citation:
      "Whipp BJ, Ward SA, Lamarra N, Davis JA, Wasserman K. Parameters of ventilatory and gas exchange dynamics during exercise. J Appl Physiol 1982;52:1506-13",
    status: "recalled",
    note: "Hold-out model: cardiodynamic phase I lasting about 15-20 s, then a mono-exponential phase II (tau 20-80 s, longer when unfit); VCO2 slower than VO2. Citation and values from memory.",
  },
  "gaesser-1996-slow-component": {
    citation: "Gaesser GA, Poole DC. The slow component of oxygen uptake kinetics in humans. Exerc Sport Sci Rev 1996;24:35-71",
    status: "recalled",
    note: "Hold-out model: extra VO2 developing slowly only above the lactate threshold. Magnitudes invented.",
  },
  "hughson-1987-lactate-continuous": {
    citation:
      "Hughson RL, Weisiger KH, Swanson GD. Blood lactate concentration increases as a continuous function in progressive exercise. J Appl Physiol 1987;62:1975-81",
    status: "recalled",
    note: "Hold-out model: lactate rising as a continuous (exponential) function of work rate; the hold-out model uses a flat baseline up to the threshold and an exponential rise above it. Citation from memory.",
  },
  "winters-1967-compensation": {
    citation:
      "Albert MS, Dell RB, Winters RW. Quantitative displacement of acid-base equilibrium in metabolic acidosis. Ann Intern Med 1967;66:312-22",
    status: "recalled",
    note: "Steady-state respiratory compensation PaCO2 = 1.5·HCO3 + 8 (slope 1.5 mmHg per mmol/L). The hold-out model uses 0.7-1.4 mmHg per mmol/L of lactate above the compensation onset (an incomplete, acute compensation; invented fraction).",
  },
  "hey-1966-pattern": {
    citation:
      "Hey EN, Lloyd BB, Cunningham DJC, Jukes MGM, Bolton DPG. Effects of various respiratory stimuli on the depth and frequency of breathing in man. Respir Physiol 1966;1:193-205",
    status: "recalled",
    note: "Tidal volume rises with ventilation and levels off near half the vital capacity, further ventilation comes from rate. The hold-out model's saturating exponential law and its parameters are invented.",
  },
  "tidal-pco2-oscillation": {
    citation:
      "Alveolar PCO2 rises through expiration as CO2 enters the lung volume, so end-tidal PCO2 exceeds mean alveolar (≈ arterial) PCO2 in exercise (respiratory physiology textbooks; Jones NL et al. 1979 J Appl Physiol 47:954 for PETCO2 > PaCO2 with large VT)",
    status: "common-practice",
    note: "Hold-out model: end-tidal excess = ½·(PB − 47)·VCO2·Texp/EELV, diluted by alveolar dead space. The Jones 1979 citation is recalled (clinical-reference marks it M); lung volumes invented.",
  },
  "acsm-metabolic-equations": {
    citation:
      "ACSM's Guidelines for Exercise Testing and Prescription, 10th ed., Table 6.3 metabolic calculations, as reproduced by Bushman BA. Metabolic calculations in action part 2. ACSM Health Fit J 2020;24(4):5-8",
    status: "secondary",
    doi: "10.1249/FIT.0000000000000577",
    note: "Walking VO2 = 3.5 + 0.1·S + 1.8·S·G; running VO2 = 3.5 + 0.2·S + 0.9·S·G (mL/kg/min, S in m/min, G grade as a fraction), seen in the reproduction.",
  },
  "jones-1996-treadmill-grade": {
    citation:
      "Jones AM, Doust JH. A 1% treadmill grade most accurately reflects the energetic cost of outdoor running. J Sports Sci 1996;14:321-7",
    status: "recalled",
    note: "Hold-out model: running protocols held at 1 % grade. Citation from memory.",
  },
  "tanaka-2001-hrmax": {
    citation: "Tanaka H, Monahan KD, Seals DR. Age-predicted maximal heart rate revisited. J Am Coll Cardiol 2001;37:153-6",
    status: "secondary",
    note: "HRmax = 208 − 0.7·age, seen in a later abstract (Front Physiol 2018, doi 10.3389/fphys.2018.00226); journal details recalled. Hold-out model: chronotropic index (share of HR reserve used) 0.55-1.0 by group, invented; below 0.80 is impaired (clinical-reference, Brubaker & Kitzman).",
  },
  "audit-model-invented": {
    citation:
      "Invented values of the cpet-desk audit model (lib/synthetic/generateAuditTest.ts): group ranges, lags, excess-CO2 and hyperventilation shapes, noise and artefact magnitudes",
    status: "our-choice",
    note: "Audit model: every number not tied to another source id is invented data for blind validation of the threshold detectors.",
  },
  "audit-mean-response-time": {
    citation:
      "Linear systems: a pure delay D followed by a first-order lag τ delays a ramp by its mean response time D + τ; the asymptotes of a filtered hinge meet D + τ after the input corner (control and kinetics textbooks)",
    status: "common-practice",
    note: "Audit model: defines where the thresholds set on muscle VO2 appear at the mouth (T1 = t1 + D + τC, T2 = t2 + Dc + τVE).",
  },
  "audit-tidal-pco2-rise": {
    citation:
      "Alveolar PCO2 rises through expiration as CO2 enters the lung: ΔP ≈ (PB − 47)·VCO2·Te/lung volume; end-tidal PCO2 ≈ mean alveolar + half that rise (respiratory physiology textbooks)",
    status: "common-practice",
    note: "Audit model: lung volume = end-expiratory volume + half a tidal volume (invented choice).",
  },
  "lewthwaite-2021-vt": {
    citation:
      "Lewthwaite H et al. Normative cardiopulmonary exercise test responses at the ventilatory threshold in Canadian adults 40 to 80 years of age. Chest 2021;159:1922",
    status: "confirmed",
    note: "96 healthy adults: VO2 at VT 48.3 ± 10.6 % of measured peak (5th pct 32.6); VE/VCO2 at VT 30.2 ± 3.8; PETCO2 at VT 40.6 ± 4.2 mmHg (clinical-confirmations §9, C). Title recalled.",
  },
  "cross-check-model-invented": {
    citation:
      "Invented values of the cpet-desk cross-check model (lib/synthetic/generateCrossCheckTest.ts): group mix and ranges, protocol choices, lags, lactate curve shape, noise and artefact magnitudes",
    status: "our-choice",
    note: "Cross-check model: every number not tied to another source id is invented data, written independently of the threshold detectors for blind checks.",
  },
  "wasserman-unloaded-pedalling": {
    citation:
      "Wasserman K, Hansen JE, Sue DY et al. Principles of Exercise Testing and Interpretation (textbook): VO2 of unloaded pedalling ≈ 150 + 6·weight (kg) mL/min",
    status: "recalled",
    note: "Cross-check model: steady VO2 at 0 W. Equation and attribution from memory.",
  },
  "sue-1988-modified-v-slope": {
    citation:
      "Sue DY, Wasserman K, Moricca RB, Casaburi R. Metabolic acidosis during exercise in patients with chronic obstructive pulmonary disease. Chest 1988;94:931-8",
    status: "confirmed",
    note: "Lower VCO2-vs-VO2 slope ≈ 1 in fed subjects (clinical-reference [S9], C). Author list recalled.",
  },
  "jones-1979-petco2-paco2": {
    citation:
      "Jones NL, Robertson DG, Kane JW. Difference between end-tidal and arterial PCO2 in exercise. J Appl Physiol 1979;47:954-60",
    status: "recalled",
    note: "PaCO2 = 5.5 + 0.90·PETCO2 − 0.0021·VT (mL) (clinical-reference §5.5, M). Cross-check model inverts it to derive PETCO2 from PaCO2 and VT.",
  },
  "arena-2007-ventilatory-classes": {
    citation:
      "Arena R, Myers J, Abella J et al. Development of a ventilatory classification system in patients with heart failure. Circulation 2007;115:2410-7",
    status: "confirmed",
    pmid: "17452607",
    note: "VE/VCO2 slope classes ≤29 / 30-35.9 / 36-44.9 / ≥45 (clinical-reference §3.2, C). Author list and pages recalled.",
  },
  "arena-2006-petco2-rest": {
    citation:
      "Arena R, Peberdy MA, Myers J et al. Prognostic value of resting end-tidal carbon dioxide in patients with heart failure. Int J Cardiol 2006;109:351-8",
    status: "confirmed",
    note: "121 heart-failure patients, mean resting PETCO2 34.1 mmHg (clinical-confirmations §2, C). Title and authors recalled.",
  },
  "friend-ve-vco2-reference": {
    citation: "FRIEND registry reference standards for the VE/VCO2 slope (treadmill). J Cardiopulm Rehabil Prev",
    status: "confirmed",
    note: "50th percentile rises 27.1 → 33.9 (men) and 28.5 → 33.7 (women) from the 3rd to the 8th decade (clinical-reference [S24], C). Year and authors not seen.",
  },
  "kaminsky-2017-cycle-standards": {
    citation:
      "Kaminsky LA et al. Cardiorespiratory fitness reference standards for cycle ergometry (FRIEND). Mayo Clin Proc 2017",
    status: "confirmed",
    note: "Cycle tests included with peak RER ≥ 1.10 (clinical-reference [S8], C).",
  },
  "cole-1999-hr-recovery": {
    citation:
      "Cole CR, Blackstone EH, Pashkow FJ, Snader CE, Lauer MS. Heart-rate recovery immediately after exercise as a predictor of mortality. N Engl J Med 1999;341:1351-7",
    status: "confirmed",
    note: "Heart-rate recovery ≤ 12 bpm at 1 min abnormal (clinical-reference §2, C).",
  },
  "hansen-1984-predicted": {
    citation: "Hansen JE, Sue DY, Wasserman K. Predicted values for clinical exercise testing. Am Rev Respir Dis 1984;129:S49-55",
    status: "confirmed",
    note: "AT/VO2max > 40 %; peak VD/VT < 0.28 (clinical-reference §2, C).",
  },
});

/**
 * Sources behind the second-opinion synthetic model (generateSecondOpinionTest). Its output is invented data;
 * these sources say where its typical values and equations come from.
 */
export const SECOND_OPINION_SOURCES = defineSources({
  "hansen-1987-vo2-work-rate": {
    citation:
      "Relation of oxygen uptake to work rate in normal men and men with circulatory disorders. Am J Cardiol 1987;59:669-74",
    status: "confirmed",
    pmid: "3825911",
    note: "ΔVO2/ΔWR 10.29 ± 1.01 mL/min/W in 54 normal men; 8.29 ± 1.17 in many men with circulatory disorders (abstract, clinical-confirmations §6). Author list recalled (Hansen, Sue, Oren, Wasserman).",
  },
  "ozyener-2011-ramp-slope": {
    citation: "Özyener F et al. J Sports Sci Med 2011;10:584",
    status: "confirmed",
    note: "Incremental-ramp ΔVO2/ΔWR 10.3 ± 0.7 mL/min/W in 10 healthy men (abstract, clinical-confirmations §6).",
  },
  "beaver-1986-excess-co2": {
    citation:
      "Beaver WL, Wasserman K, Whipp BJ. A new method for detecting anaerobic threshold by gas exchange. J Appl Physiol 1986;60:2020-7",
    status: "confirmed",
    pmid: "3087938",
    note: "Excess CO2 from bicarbonate buffering of lactic acid, ≈22 mL CO2 per mEq; respiratory compensation found separately on VE vs VCO2 and always higher (abstract, clinical-confirmations §4). Used for 22.4 mL CO2 per mmol buffered.",
  },
  "sue-1988-lower-slope": {
    citation: "Sue DY, Wasserman K, Moricca RB, Casaburi R. Chest 1988;94:931-8",
    status: "confirmed",
    note: "Lower VCO2–VO2 slope ≈ 1 in fed subjects (clinical-reference §5.3, C). Author list recalled.",
  },
  "whipp-1982-vo2-kinetics": {
    citation:
      "Whipp BJ, Ward SA, Lamarra N, Davis JA, Wasserman K. Parameters of ventilatory and gas exchange dynamics during exercise. J Appl Physiol 1982;52:1506-13",
    status: "recalled",
    note: "Phase-2 first-order VO2 kinetics after a transit delay; longer time constants with age and disease. Citation and ranges recalled, not seen.",
  },
  "poole-1994-slow-component": {
    citation: "Poole DC, Barstow TJ, Gaesser GA, Willis WT, Whipp BJ. VO2 slow component. Med Sci Sports Exerc 1994;26:1354-8",
    status: "recalled",
    note: "Extra, slowly developing VO2 above the lactate threshold. Citation recalled; sizes invented.",
  },
  "ward-2021-ve-vco2": {
    citation:
      "Ward SA. Ventilation/carbon dioxide output relationships during exercise in health. Eur Respir Rev 2021 (PMID 33853883)",
    status: "secondary",
    pmid: "33853883",
    note: "Linear VE–VCO2 relation below the respiratory compensation point; slope to the RCP as the physiological definition (clinical-reference §5.5, C2).",
  },
  "friend-ve-vco2-slope-reference": {
    citation: "FRIEND registry reference standards for the VE/VCO2 slope (treadmill). J Cardiopulm Rehabil Prev",
    status: "confirmed",
    note: "50th percentile 27.1 → 33.9 (men), 28.5 → 33.7 (women) from the 3rd to the 8th decade (clinical-reference [S24], C). Year and authors not seen.",
  },
  "arena-2007-slope-classes": {
    citation:
      "Arena R, Myers J, Abella J et al. Development of a ventilatory classification system in patients with heart failure. Circulation 2007;115:2410-7",
    status: "confirmed",
    pmid: "17452607",
    note: "Ventilatory classes I ≤ 29, II 30.0–35.9, III 36.0–44.9, IV ≥ 45.0 (clinical-reference §3.2, C). Title and authors recalled.",
  },
  "janicki-1988-weber-classes": {
    citation:
      "Janicki JS, Weber KT, McElroy PA. Use of the cardiopulmonary exercise test to evaluate the patient with chronic heart failure. Eur Heart J 1988;9 Suppl H",
    status: "confirmed",
    pmid: "3169052",
    note: "Peak VO2 classes A > 20, B 16–20, C 10–16, D < 10 mL/kg/min (clinical-confirmations §1, C).",
  },
  "lewthwaite-2021-normal-vt": {
    citation: "Lewthwaite H et al. Chest 2021;159:1922 (CanCOLD healthy adults 40–80 y)",
    status: "confirmed",
    note: "VO2 at VT 48.3 ± 10.6 % of peak; VE/VCO2 at VT 30.2 ± 3.8; PETCO2 at VT 40.6 ± 4.2 mmHg (clinical-confirmations §9, C).",
  },
  "lamarra-1987-breath-fluctuations": {
    citation:
      "Lamarra N, Whipp BJ, Ward SA, Wasserman K. Effect of interbreath fluctuations on characterizing exercise gas exchange kinetics. J Appl Physiol 1987",
    status: "confirmed",
    note: "Breath noise roughly Gaussian with SD largely independent of metabolic rate (abstract, clinical-confirmations §5). Volume/page recalled.",
  },
  "liang-1996-breath-autocorrelation": {
    citation: "Liang PJ, Pandit JJ, Robbins PA. J Appl Physiol 1996;81:2274",
    status: "confirmed",
    note: "Breath-to-breath ventilation autocorrelated (1 of 60 series white) (clinical-confirmations §5, C).",
  },
  "radtke-2019-ers-cpet": {
    citation: "Radtke T et al. ERS statement on standardisation of CPET in chronic lung disease. Eur Respir Rev 2019;28:180101",
    status: "confirmed",
    note: "Incremental phase 8–12 min; VEpeak/MVV ≥ 85 % = ventilatory limitation (clinical-reference §2, §5.1, C).",
  },
  "eov-definitions-review": {
    citation: "Exercise oscillatory ventilation criteria table, Cardiology Research 2025;16(6):475",
    status: "secondary",
    note: "Cycle length 30–140 s; amplitude ≥ 15 % (rest) to > 25–30 % (concurrent mean VE) across definitions (clinical-reference §5.6, C2).",
  },
  "hadeli-2001-desaturation": {
    citation: "Hadeli KO et al. Chest 2001;120:88",
    status: "confirmed",
    note: "Exercise desaturation = SpO2 fall ≥ 4 % (clinical-reference §2, C).",
  },
  "tanaka-2001-age-hrmax": {
    citation: "Tanaka H, Monahan KD, Seals DR. Age-predicted maximal heart rate revisited. J Am Coll Cardiol 2001;37:153-6",
    status: "secondary",
    note: "HRmax = 208 − 0.7·age (clinical-reference §2, C2). Pages recalled.",
  },
  "acsm-walking-running-cost": {
    citation: "ACSM's Guidelines for Exercise Testing and Prescription, metabolic equations for walking and running",
    status: "recalled",
    note: "Walking VO2 = 3.5 + 0.1·S + 1.8·S·G; running 3.5 + 0.2·S + 0.9·S·G (mL/kg/min, S m/min, G fraction). Recalled, not seen.",
  },
  "wasserman-unloaded-cost": {
    citation: "Wasserman K, Hansen JE, Sue DY et al. Principles of Exercise Testing and Interpretation (textbook)",
    status: "recalled",
    note: "VO2 of unloaded pedalling ≈ 150 + 6 × body mass (kg) mL/min; used as 150 + 5.8·kg. Recalled, not seen.",
  },
  "jones-1979-petco2": {
    citation:
      "Jones NL, Robertson DG, Kane JW. Difference between end-tidal and arterial PCO2 in exercise. J Appl Physiol 1979;47:954-60",
    status: "recalled",
    note: "PETCO2 exceeds PaCO2 during exercise, growing with CO2 output and tidal volume. Citation and direction recalled; size invented.",
  },
  "alveolar-gas-equations": {
    citation:
      "Alveolar ventilation equation PaCO2 = 0.863·VCO2/VA and alveolar gas equation PAO2 = PIO2 − PACO2·(FIO2 + (1 − FIO2)/R) (respiratory physiology textbooks)",
    status: "common-practice",
  },
  "second-opinion-invented": {
    citation:
      "Invented values of the cpet-desk second-opinion synthetic model (no published source; plausible physiology chosen by the authors)",
    status: "our-choice",
    note: "Group ranges, time constants, lactate shape, buffer pool, compensation gain, noise levels and artefacts are invented data for tests.",
  },
});
