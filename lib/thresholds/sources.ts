import { defineSources } from "../core/source";

/**
 * Sources for peaks, effort, indices, lactate thresholds and intensity domains.
 * Status follows the clinical sheets' marks: C → confirmed, C2 → secondary, M → recalled.
 * Generic ids (`common-practice`, `radtke-2019`, `ats-accp-2003`, `robergs-2010`) live in CORE_SOURCES.
 */
export const THRESHOLD_SOURCES = defineSources({
  "peak-rolling-average": {
    citation:
      "Highest 20-30 s average in exercise as the peak value: for VO2 near end-exercise (common practice; survey: Robergs, Dwyer & Astorino 2010, Sports Med 40:95), and by the same rule for HR, VE, PETCO2 and the other channels (our extension)",
    status: "common-practice",
  },
  "implementation-choice": {
    citation: "Implementation choice of this software, stated in the method label (no published source)",
    status: "our-choice",
    note: "Used for windows, tolerances and classification rules that no source fixes; see lib/thresholds/README.md.",
  },
  "jacc-hf-2020-peak-rer": {
    citation: "Peak respiratory exchange ratio subgroups in heart failure prognosis, JACC Heart Fail 2020 (PMC7296992)",
    status: "confirmed",
    note: "Peak RER ≥1.10 as maximal effort seen in the abstract; author list not recorded.",
  },
  "mehra-2016-ishlt": {
    citation: "Mehra MR et al. ISHLT listing criteria for heart transplantation: a 10-year update. J Heart Lung Transplant 2016",
    status: "secondary",
    note: "Maximal test = RER >1.05, seen only in a tabulation (ESC Heart Fail, PMC8006697 Table 2), not in the statement itself.",
  },
  "myers-2017-friend": {
    citation: "Myers J et al. FRIEND registry treadmill reference cohort. Prog Cardiovasc Dis 2017",
    status: "confirmed",
    note: "Inclusion peak RER ≥1.0 (treadmill).",
  },
  "kaminsky-2017-friend-cycle": {
    citation: "Kaminsky LA et al. FRIEND cycle ergometry reference standards. Mayo Clin Proc 2017",
    status: "confirmed",
    note: "Inclusion peak RER ≥1.10 (cycle).",
  },
  "rapp-2018": {
    citation: "Rapp D et al. BMJ Open 2018;8:e018697",
    status: "confirmed",
    note: "Composite maximal-effort example: RER ≥1.1 or lactate ≥8 mmol/L or HR ≥90% predicted.",
  },
  "respir-res-2021-guide": {
    citation: "Practical guide to cardiopulmonary exercise testing in adults. Respir Res 2021 (s12931-021-01895-6), Table 1",
    status: "secondary",
    note: "Peak HR ≥85% predicted and HR reserve <15 bpm; BR 15-20% or 11-15 L/min; resting PETCO2 <33 mmHg.",
  },
  "sun-2002": {
    citation:
      "Sun XG, Hansen JE, Garatachea N, Storer TW, Wasserman K. Ventilatory efficiency during exercise in healthy subjects. Am J Respir Crit Care Med 2002;166:1443",
    status: "confirmed",
    doi: "10.1164/rccm.2202033",
    note: "Lowest VE/VCO2 (nadir) as the ventilatory-efficiency index.",
  },
  "ward-2021": {
    citation:
      "Ward SA. Ventilation/carbon dioxide output relationships during exercise in health. Eur Respir Rev 2021 (PMID 33853883)",
    status: "secondary",
    note: "VE/VCO2 slope up to the respiratory compensation point (physiological definition).",
  },
  "friend-ve-vco2-slope": {
    citation: "FRIEND registry reference standards for the VE/VCO2 slope, J Cardiopulm Rehabil Prev",
    status: "confirmed",
    note: "Slope from start of exercise to peak.",
  },
  "healthcare-2023-slope-methods": {
    citation: "VE/VCO2 slope calculation methods compared. Healthcare 2023;11:1292 (PMID 37174834)",
    status: "confirmed",
    note: "Slope to RCP and whole-test slope differ by about 4 units.",
  },
  "baba-1996": {
    citation: "Baba R et al. Oxygen uptake efficiency slope. J Am Coll Cardiol 1996;28:1567",
    status: "confirmed",
    doi: "10.1016/S0735-1097(96)00412-3",
    note: "VO2 (mL/min) = a·log10 VE (L/min) + b, OUES = a, over first 75/90/100% of exercise; volume/pages recalled; log base 10 from a review (secondary).",
  },
  "hansen-1987-vo2-wr": {
    citation:
      "Relation of oxygen uptake to work rate in normal men and men with circulatory disorders. Am J Cardiol 1987;59:669-74",
    status: "confirmed",
    pmid: "3825911",
    note: "ΔVO2/ΔWR 10.29 ± 1.01 mL/min/W in 54 normal men; 8.29 ± 1.17 in many men with circulatory disorders. Author list (Hansen, Sue, Oren, Wasserman) recalled.",
  },
  "vo2-lag-exclusion": {
    citation:
      "Exclusion of the first ~1 min of the ramp from the VO2-work-rate fit because of the VO2 response lag (method detail, recalled)",
    status: "recalled",
  },
  "o2-pulse-definition": {
    citation: "O2 pulse = VO2/HR (LOINC 94120-3 definition)",
    status: "confirmed",
  },
  "ccjm-patterns": {
    citation: "Cleveland Clinic Journal of Medicine, CPET patterns table (ccjm.org)",
    status: "secondary",
    note: "Cardiac pattern: O2 pulse <80% predicted or flat; HRR ≤12; BR <15%.",
  },
  "hansen-1984-limits": {
    citation:
      "Hansen JE, Sue DY, Wasserman K. Predicted values for clinical exercise testing. Am Rev Respir Dis 1984;129:S49-55 (limits of normal stated in the abstract; its prediction equations are the separate entry hansen-1984)",
    status: "confirmed",
    note: "Breathing reserve <11 L/min unusual; VD/VT normal peak <0.28.",
  },
  "otto-yanez-2020": {
    citation: "Otto-Yáñez M et al. Front Physiol 2020;11:537 (MVV estimation from FEV1)",
    status: "confirmed",
    note: "Compared literature multipliers and advised against estimating MVV; ×35 and '35-40×' in practice are secondary reproductions.",
  },
  "mvv-fev1x40": {
    citation: "MVV ≈ FEV1 × 40 (attributed to Campbell 1982, recalled)",
    status: "recalled",
  },
  // the practice is one claim (seen in secondary pages), the attribution another (recalled, in mvv-fev1x35.json); one id
  // each, so that merging the registries cannot lend the attribution the practice's stronger status
  "mvv-fev1x35-practice": {
    citation: "MVV ≈ FEV1 × 35 used in practice ('35–40 × FEV1'), seen in secondary pages; compared in Otto-Yáñez 2020",
    status: "secondary",
  },
  "breathing-reserve-definition": {
    citation: "Breathing reserve BR = MVV − VEpeak (L/min) and BR% = 100·(1 − VEpeak/MVV) (definition, recalled)",
    status: "recalled",
  },
  "cole-1999": {
    citation:
      "Cole CR, Blackstone EH, Pashkow FJ, Snader CE, Lauer MS. Heart-rate recovery immediately after exercise as a predictor of mortality. N Engl J Med 1999;341:1351-7",
    status: "confirmed",
    pmid: "10536127",
    note: "HR recovery at 1 min ≤12 bpm abnormal; chronotropic index (HRpeak − HRrest)/(HRpred − HRrest) < 0.80 impaired, HRpred = 220 − age.",
  },
  "cole-2000": {
    citation:
      "Cole CR et al. Heart rate recovery after submaximal exercise testing as a predictor of mortality. Ann Intern Med 2000;132:552-5",
    status: "confirmed",
    pmid: "10744592",
    note: "HR recovery at 2 min ≤42 bpm abnormal after a submaximal test.",
  },
  "brubaker-kitzman-beta-blocker": {
    citation: "Chronotropic index cut-off < 0.62 on beta-blockers (Brubaker & Kitzman, recalled)",
    status: "recalled",
  },
  "fox-hrmax": {
    citation: "HRmax = 220 − age (Fox; history in Robergs & Landwehr, JEPonline 2002)",
    status: "secondary",
    note: "The 1971 paper was not seen; the formula was seen in Robergs & Landwehr 2002 and in Cole et al. NEJM 1999.",
  },
  "hadeli-2001": {
    citation: "Hadeli KO et al. Chest 2001;120:88",
    status: "confirmed",
    note: "Exercise desaturation = SpO2 fall ≥4%.",
  },
  "respiration-2012-desaturation": {
    citation: "Respiration 2012;84:353 (PMID 22269699)",
    status: "confirmed",
    note: "Exercise desaturation = SpO2 fall >4% to below 90%.",
  },
  "andrianopoulos-2014": {
    citation: "Andrianopoulos V et al. Respir Physiol Neurobiol 2014",
    status: "confirmed",
    note: "Exercise desaturation = SpO2 nadir ≤88%.",
  },
  "bohr-enghoff": {
    citation: "Bohr-Enghoff dead-space fraction VD/VT = 1 − 863/(PaCO2·VE/VCO2), VE BTPS, VCO2 STPD (recalled form)",
    status: "recalled",
  },
  "alveolar-gas-equation": {
    citation:
      "Alveolar gas equation PAO2 = FiO2·(PB − 47) − PaCO2·[FiO2 + (1 − FiO2)/R], room-air FiO2 0.2093, water vapour 47 mmHg at 37 °C (full form recalled)",
    status: "common-practice",
  },
  "eov-criteria-review-2025": {
    citation: "EOV criteria table, Cardiology Research 2025;16(6):475",
    status: "secondary",
    note: "Cycle length = time between nadirs; amplitude = peak minus mean of adjacent nadirs; Leite, Corrà and AHA rules tabulated.",
  },
  "leite-2003": {
    citation:
      "Leite JJ et al. Periodic breathing during incremental exercise predicts mortality in heart failure. J Am Coll Cardiol 2003 (details recalled)",
    status: "secondary",
    note: "≥3 regular cycles, SD of 3 consecutive cycle lengths within 20% of their mean, mean amplitude >5 L/min (as tabulated in the 2025 review).",
  },
  "corra-2006": {
    citation:
      "Corrà U et al. Oscillatory ventilation during exercise in chronic heart failure (Corrà 2002-2006; details recalled)",
    status: "secondary",
    note: "Cycle ≈1 min, amplitude ≥15% of resting VE, persisting ≥60-66% of exercise (as tabulated in the 2025 review).",
  },
  "aha-2010-eov": {
    citation: "AHA scientific statement on CPET, 2010 (EOV consensus, as tabulated in Cardiology Research 2025)",
    status: "secondary",
    note: "Pattern persisting ≥60% of the test with amplitude ≥15% of the average resting value.",
  },
  "eov-cycle-range": {
    citation:
      "EOV cycle lengths as tabulated in Cardiology Research 2025;16(6):475: Ben-Dov 1992 cycles of 30-60 s, Sun 2010 cycles of 40-140 s",
    status: "secondary",
    note: "A cycle counts for any EOV rule only if its length lies within 30-140 s, the span of the published cycle-length criteria.",
  },
  "brawner-2018": {
    citation:
      "Brawner CA et al. Exercise oscillatory ventilation: interreviewer agreement and a novel determination. Med Sci Sports Exerc 2018;50(2):369-374",
    status: "confirmed",
    doi: "10.1249/MSS.0000000000001423",
    note: "Reviewers agreed better on EOV with 30-s rolling averages (kappa 0.429) than with 10-s discrete averages (0.303); positive EOV 14 % vs 18 % of 243 HF patients (abstract).",
  },
  "sjodin-jacobs-1981": {
    citation:
      "Sjödin B, Jacobs I. Onset of blood lactate accumulation and marathon running performance. Int J Sports Med 1981;2:23-26",
    status: "confirmed",
    doi: "10.1055/s-2008-1034579",
    note: "OBLA = work rate or speed at 4 mmol/L.",
  },
  "bishop-1998": {
    citation:
      "Bishop D, Jenkins DG, Mackinnon LT. The relationship between plasma lactate parameters, Wpeak and 1-h cycling performance in women. Med Sci Sports Exerc 1998;30(8):1270-5",
    status: "confirmed",
    note: "LT1 = power at which lactate has risen 1 mmol/L above baseline; modified Dmax named.",
  },
  "bishop-1998-mod-dmax-rule": {
    citation:
      "Modified Dmax chord start = the point before the first rise in lactate >0.4 mmol/L (Bishop et al. 1998; rule recalled)",
    status: "recalled",
  },
  "beaver-1985-loglog": {
    citation:
      "Beaver WL, Wasserman K, Whipp BJ. Improved detection of lactate threshold during exercise using a log-log transformation. J Appl Physiol 1985;59:1936 (citation recalled)",
    status: "secondary",
    note: "Named in Bishop 1998 (confirmed); log-log two-line model seen in a secondary abstract; citation details recalled.",
  },
  "cheng-1992-dmax": {
    citation:
      "Cheng B et al. A new approach for the determination of ventilatory and lactate thresholds. Int J Sports Med 1992;13:518 (citation recalled)",
    status: "secondary",
    note: "Cubic fit of lactate vs work; threshold at maximum perpendicular distance from the chord joining the ends (secondary description).",
  },
  "whipp-1981-ramp": {
    citation:
      "Whipp BJ, Davis JA, Torres F, Wasserman K. A test to determine parameters of aerobic function during exercise. J Appl Physiol 1981;50(1):217-221",
    status: "confirmed",
    doi: "10.1152/jappl.1981.50.1.217",
    note: "Abstract seen: a 4-8 min cycle ramp gives maximal VO2, the anaerobic threshold, work efficiency and the time constant of VO2 kinetics. The method detail used here (the ramp's linear VO2 back-extrapolated to the baseline VO2 of unloaded pedalling; the delay is the mean response time) is recalled.",
  },
  "davis-1982-ramp-slope": {
    citation:
      "Davis JA, Whipp BJ, Lamarra N, Huntsman DJ, Frank MH, Wasserman K. Effect of ramp slope on determination of aerobic parameters from the ramp exercise test. Med Sci Sports Exerc 1982;14(5):339-343",
    status: "confirmed",
    note: "Abstract seen: ramps of 20-50 W/min gave the same aerobic parameters; at 100 W/min the VO2 time constant and efficiency could not be discerned. Author list recalled (the page seen gave none).",
  },
  "faude-2009-lactate-concepts": {
    citation: "Faude O, Kindermann W, Meyer T. Lactate threshold concepts: how valid are they? Sports Med 2009;39(6):469-490",
    status: "secondary",
    note: "Citation, title and pages seen on the article's first page; its framework of two thresholds — an aerobic threshold where lactate first rises above baseline (with VT1) and an anaerobic threshold near the maximal lactate steady state (with VT2/RCP) — seen only second-hand (a teaching page redrawing Kindermann 2004 and citing Faude 2009). That lactate rises steadily in an incremental test is recalled.",
  },
  "jamnick-2018-mod-dmax": {
    citation:
      "Jamnick NA, Botella J, Pyne DB, Bishop DJ. Manipulating graded exercise test variables affects the validity of the lactate threshold and VO2peak. PLoS One 2018;13(7):e0199794",
    status: "secondary",
    note: "Modified Dmax closest to the maximal lactate steady state; Dmax depends on stage length (seen second-hand in a review report).",
  },
  "intensity-domains": {
    citation:
      "Exercise intensity domains (moderate below the gas-exchange/lactate threshold, heavy up to the respiratory compensation point, severe above) — common practice in exercise physiology and prescription",
    status: "common-practice",
  },
  "guazzi-2012-petco2": {
    citation:
      "Guazzi M et al. EACPR/AHA clinical recommendations for CPET data assessment. Eur Heart J 2012;33:2917 (PETCO2 rest <33 mmHg, rise 3-8 mmHg; cut-offs recalled)",
    status: "recalled",
  },
});
