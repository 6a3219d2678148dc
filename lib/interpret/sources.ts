import { defineSources } from "../core/source";

/**
 * Sources of the interpretation rules, flow nodes and schemes. The data files in
 * reference-equations/interpretation/ reference these ids (and the ids in lib/core/sources.ts).
 * The status here is the status of the document as seen; each data item carries its own status.
 */
export const INTERPRET_SOURCES = defineSources({
  "hansen-1984-limits": {
    citation:
      "Hansen JE, Sue DY, Wasserman K. Predicted values for clinical exercise testing. Am Rev Respir Dis 1984;129:S49-55 (limits of normal stated in the abstract; its prediction equations are the separate entry hansen-1984)",
    status: "confirmed",
    note: "Abstract seen: BR <11 L/min, AT/VO2max >40%, VD/VT <0.28, PaO2 <80 mmHg, P(A-a)O2 >38 mmHg, RR >60/min as unusual.",
  },
  "glaab-2021-guide": {
    citation:
      "Practical guide to cardiopulmonary exercise testing in adults. Respir Res 2021 (s12931-021-01895-6), Table 1 (authors from memory: Glaab T, Taube C)",
    status: "secondary",
    note: "Table 1 reproduces normal limits: peak VO2 >=85% (mild/moderate/severe <85/<70/<50%), HR reserve <15 bpm, BR <15%, PETCO2 <33 mmHg at rest, rise <3 mmHg.",
  },
  "ccjm-patterns": {
    citation: "Cleveland Clinic Journal of Medicine, CPET interpretation patterns table (ccjm.org); authors not recorded",
    status: "secondary",
    note: "Cardiac: O2 pulse <80% or flat, HRR <=12; pulmonary: RR >50, reserve <15%; muscular: AT <40% of peak VO2; deconditioning and obesity rows.",
  },
  "wasserman-textbook": {
    citation:
      "Wasserman K, Hansen JE, Sue DY, Stringer WW, Whipp BJ. Principles of Exercise Testing and Interpretation (textbook, patterns and flowcharts)",
    status: "recalled",
  },
  "cole-1999": {
    citation:
      "Cole CR, Blackstone EH, Pashkow FJ, Snader CE, Lauer MS. Heart-rate recovery immediately after exercise as a predictor of mortality. N Engl J Med 1999;341:1351-7",
    status: "confirmed",
    note: "HRR at 1 min <=12 bpm abnormal; chronotropic index <0.80 impaired (HRpred = 220 - age).",
  },
  "brubaker-kitzman-2011": {
    citation:
      "Brubaker PH, Kitzman DW. Chronotropic incompetence: causes, consequences, and management. Circulation 2011;123:1010-20",
    status: "recalled",
    note: "Chronotropic index <0.62 on beta-blockers (recalled).",
  },
  "chuang-2015": {
    citation: "Chuang ML et al. Int J Chron Obstruct Pulmon Dis 2015 (dovepress COPD article)",
    status: "secondary",
    note: "Delta VO2/delta WR abnormal <8.6 mL/min/W; VE/VCO2 nadir >34 abnormal.",
  },
  "hansen-1987-ajc": {
    citation:
      "Hansen JE, Sue DY, Oren A, Wasserman K. Relation of oxygen uptake to work rate in normal men and men with circulatory disorders. Am J Cardiol 1987;59:669-74",
    status: "confirmed",
    pmid: "3825911",
    note: "10.29 +/- 1.01 mL/min/W in 54 normal men; author list from memory.",
  },
  "hadeli-2001": {
    citation:
      "Hadeli KO, Siegel EM, Sherrill DL, Beck KC, Enright PL. Predictors of oxygen desaturation during submaximal exercise in 8,000 patients. Chest 2001;120:88-92",
    status: "confirmed",
    note: "Desaturation = fall >=4 percentage points.",
  },
  "respiration-2012-desat": {
    citation: "Exercise desaturation in COPD, Respiration 2012;84:353 (PMID 22269699)",
    status: "confirmed",
    pmid: "22269699",
    note: "Desaturation = fall >4 percentage points to below 90%.",
  },
  "andrianopoulos-2014": {
    citation: "Andrianopoulos V et al. Exercise-induced oxygen desaturation in COPD. Respir Physiol Neurobiol 2014",
    status: "confirmed",
    note: "Desaturation = nadir SpO2 <=88%.",
  },
  "janicki-1988": {
    citation:
      "Janicki JS, Weber KT, McElroy PA. Use of the cardiopulmonary exercise test to evaluate the patient with chronic heart failure. Eur Heart J 1988;9 Suppl H",
    status: "confirmed",
    pmid: "3169052",
    note: "Classes A-D by peak VO2 (>20, 16-20, 10-16, <10) or AT (>14, 11-14, 8-11, <8) mL/kg/min.",
  },
  "weber-1982": {
    citation:
      "Weber KT, Kinasewitz GT, Janicki JS, Fishman AP. Oxygen utilization and ventilation during exercise in patients with chronic cardiac failure. Circulation 1982;65:1213-23",
    status: "recalled",
  },
  "arena-2007": {
    citation:
      "Arena R, Myers J, Abella J et al. Development of a ventilatory classification system in patients with heart failure. Circulation 2007 (PMID 17452607)",
    status: "confirmed",
    pmid: "17452607",
    note: "VC-I <=29 (abstract) / VC-II 30.0-35.9 / VC-III 36.0-44.9 / VC-IV >=45.0; 2-y event-free survival 97.2/85.2/72.3/44.2%.",
  },
  "arena-2008-hosp": {
    citation: "Arena R et al. Ventilatory classification and hospitalisation in heart failure (2008), VC-I <=29.9",
    status: "confirmed",
  },
  "guazzi-2012": {
    citation:
      "Guazzi M, Adams V, Conraads V et al. EACPR/AHA Clinical recommendations for cardiopulmonary exercise testing data assessment in specific patient populations. Eur Heart J 2012;33:2917-27; Circulation 2012;126:2261-74",
    status: "recalled",
    doi: "10.1093/eurheartj/ehs221",
    note: "Document confirmed to exist; its prognostic table cut-offs recalled (several independently supported).",
  },
  "guazzi-2016": {
    citation:
      "Guazzi M, Arena R, Halle M et al. 2016 focused update: clinical recommendations for cardiopulmonary exercise testing data assessment in specific patient populations (EACPR/AHA); journal details from memory (Eur Heart J 2018;39:1144)",
    status: "recalled",
  },
  "myers-cpx-2014": {
    citation:
      "Ritt LE, Myers J, Stein R et al. Additive prognostic value of a cardiopulmonary exercise test score in patients with heart failure. Int J Cardiol 2014",
    status: "confirmed",
    note: "CPX score: VE/VCO2 slope >=34, HRR1 <=6, OUES <=1.4, PETCO2 <33 mmHg.",
  },
  "gitt-2002": {
    citation:
      "Gitt AK, Wasserman K, Kilkowski C et al. Exercise anaerobic threshold and ventilatory efficiency identify heart failure patients for high risk of early death. Circulation 2002",
    status: "confirmed",
    pmid: "12473555",
    note: "AT <11 mL/kg/min with VE/VCO2 slope >34: 6-month mortality RR 5.1 (223 CHF).",
  },
  "galie-2015-ph": {
    citation:
      "Galiè N, Humbert M, Vachiery JL et al. 2015 ESC/ERS Guidelines for the diagnosis and treatment of pulmonary hypertension (risk table); journal details from memory (Eur Heart J 2016;37:67-119)",
    status: "secondary",
    note: "CPET rows seen in reproductions: peak VO2 >15 / 11-15 / <11 mL/kg/min (>65 / 35-65 / <35% pred); VE/VCO2 slope <36 / 36-44.9 / >=45.",
  },
  "humbert-2022-ph": {
    citation:
      "Humbert M, Kovacs G, Hoeper MM et al. 2022 ESC/ERS Guidelines for the diagnosis and treatment of pulmonary hypertension. Eur Heart J 2022",
    status: "recalled",
    doi: "10.1093/eurheartj/ehac237",
    note: "Guideline confirmed; CPET rows of its three-strata table recalled (slope <36 / 36-44 / >44).",
  },
  "brunelli-2009": {
    citation:
      "Brunelli A, Charloux A, Bolliger CT et al. ERS/ESTS clinical guidelines on fitness for radical therapy in lung cancer patients. Eur Respir J 2009;34:17-41",
    status: "secondary",
    note: "Algorithm seen in a review (PMC4283874); ppo = pre-op x (1 - resected/19 segments) recalled.",
  },
  "brunelli-2013-accp": {
    citation:
      "Brunelli A, Kim AW, Berger KI, Addrizzo-Harris DJ. Physiologic evaluation of the patient with lung cancer being considered for resectional surgery (ACCP guidelines, 3rd ed). Chest 2013;143(5 Suppl):e166S-e190S",
    status: "secondary",
  },
  "older-1993": {
    citation:
      "Older P, Smith R, Courtney P, Hone R. Preoperative evaluation of cardiac failure and ischemia in elderly patients by cardiopulmonary exercise testing. Chest 1993;104:701-4",
    status: "confirmed",
    note: "AT <11 mL/kg/min: mortality 18% vs 0.8%; low AT with ischaemia 42%.",
  },
  "older-1999": {
    citation:
      "Older P, Hall A, Hader R. Cardiopulmonary exercise testing as a screening test for perioperative management of major surgery in the elderly. Chest 1999;116:355-62",
    status: "confirmed",
    pmid: "10453862",
    note: "Triage by AT, ischaemia and surgical stress; the numeric AT rule is recalled.",
  },
  "periop-3tier-s34": {
    citation:
      "Perioperative CPET three-tier risk scheme (Authorea preprint, authorea.com/users/424398/articles/556575); authors not recorded",
    status: "confirmed",
    note: "Low AT >=11; intermediate one of AT 8-10.9, VE/VCO2 at AT >34, IHD; high AT <8 or >=2 of those.",
  },
  "levett-2018-poetts": {
    citation:
      "Levett DZH, Jack S, Swart M et al. Perioperative cardiopulmonary exercise testing (CPET): consensus clinical guidelines. Br J Anaesth 2018;120:484-500",
    status: "recalled",
    note: "Consensus confirmed to exist; no single universal cut-off endorsed (content recalled).",
  },
  "wilson-2010": {
    citation:
      "Wilson RJT, Davies S, Yates D, Redman J, Stone M. Impaired functional capacity is associated with all-cause mortality after major elective intra-abdominal surgery. Br J Anaesth 2010 (105:297 from memory)",
    status: "confirmed",
  },
  "west-2016": {
    citation:
      "West MA, Asher R, Browning M et al. Validation of preoperative CPET-derived variables to predict in-hospital morbidity after major colorectal surgery. Br J Surg 2016;103:744",
    status: "confirmed",
    pmid: "26914526",
  },
  "west-2014-rectal": {
    citation:
      "West MA et al. Cardiopulmonary exercise variables are associated with postoperative morbidity after major colonic/rectal surgery (rectal cohort). Br J Surg 2014;101:1166",
    status: "confirmed",
    pmid: "24916313",
  },
  "lai-2013": {
    citation:
      "Lai CW, Minto G, Challand CP et al. Patients' inability to perform a preoperative cardiopulmonary exercise test or demonstrate an anaerobic threshold is associated with inferior outcomes after major colorectal surgery. Br J Anaesth 2013",
    status: "confirmed",
    doi: "10.1093/bja/aet193",
  },
  "rose-2018": {
    citation: "Rose GA et al. CPET and 2-year mortality after abdominal aortic aneurysm repair. Exp Physiol 2018",
    status: "confirmed",
  },
  "mehra-2016": {
    citation:
      "Mehra MR, Canter CE, Hannan MM et al. The 2016 International Society for Heart Lung Transplantation listing criteria for heart transplantation: a 10-year update. J Heart Lung Transplant 2016;35:1-23",
    status: "secondary",
    note: "CPET criteria seen only in a tabulation (ESC Heart Fail, PMC8006697 Table 2), not in the statement itself: secondary by our definition, though the project's reference sheet marks it confirmed.",
  },
  "who-bmi": {
    citation:
      "World Health Organization. Obesity: preventing and managing the global epidemic. WHO Technical Report Series 894, 2000 (BMI >=30 kg/m2)",
    status: "recalled",
  },
  "who-anaemia-1968": {
    citation:
      "World Health Organization. Nutritional anaemias. WHO Technical Report Series 405, 1968 (Hb <13 g/dL men, <12 g/dL women)",
    status: "recalled",
  },
  "bensimhon-2008": {
    citation:
      "Bensimhon DR, Leifer ES, Ellis SJ et al. Reproducibility of peak oxygen uptake and other cardiopulmonary exercise testing parameters in patients with heart failure (HF-ACTION). Am J Cardiol 2008;102:712-7",
    status: "confirmed",
    pmid: "18773994",
  },
  "barron-2014": {
    citation:
      "Barron A et al. Test-retest repeatability of cardiopulmonary exercise test variables in patients with cardiac or respiratory disease. Eur J Prev Cardiol 2014 (PMID 24398370; first author from memory)",
    status: "confirmed",
    pmid: "24398370",
  },
  "coeckelberghs-2016": {
    citation:
      "Coeckelberghs E et al. Test-retest reliability of maximal and submaximal gas exchange variables in patients with coronary artery disease. J Cardiopulm Rehabil Prev 2016;36:263",
    status: "confirmed",
  },
  "van-laethem-2009": {
    citation: "Van Laethem C et al. Reproducibility of the oxygen uptake efficiency slope in healthy subjects (2009)",
    status: "confirmed",
  },
  "decato-2018": {
    citation:
      "Decato TW, Bradley SM, Wilson EL, Hegewald MJ. Repeatability and meaningful change of CPET parameters in healthy subjects. Med Sci Sports Exerc 2018;50:589",
    status: "confirmed",
  },
  "sdc-statistics": {
    citation:
      "Smallest detectable change SDC = 1.96 x sqrt(2) x SEM, SEM from a within-subject SD or CoV (standard measurement statistics; e.g. Weir JP, J Strength Cond Res 2005;19:231, recalled)",
    status: "common-practice",
  },
  "jacc-hf-2020-rer": {
    citation: "Peak respiratory exchange ratio subgroups and prognosis in heart failure. JACC Heart Fail 2020 (PMC7296992)",
    status: "confirmed",
    note: "Peak RER >=1.10 taken as maximal effort in heart-failure prognosis.",
  },
  "myers-2017-friend": {
    citation:
      "Myers J, Kaminsky LA, Lima R et al. A reference equation for normal standards for VO2max: analysis from FRIEND. Prog Cardiovasc Dis 2017",
    status: "confirmed",
    note: "Treadmill tests with RER >=1.0 included.",
  },
  "friend-vevco2": {
    citation:
      "FRIEND reference standards for the VE/VCO2 slope (whole-test slope). J Cardiopulm Rehabil Prev (nursingcenter Article 5842916)",
    status: "confirmed",
  },
  "ward-2021": {
    citation:
      "Ward SA. Ventilation/carbon dioxide output relationships during exercise in health. Eur Respir Rev 2021 (PMID 33853883)",
    status: "secondary",
    note: "Physiological slope from start of exercise to RCP.",
  },
  "cardiol-res-2025-eov": {
    citation: "Exercise oscillatory ventilation criteria table. Cardiology Research 2025;16(6):475",
    status: "secondary",
    note: "EOV definitions (Kremser/Corrà, AHA 2010, Leite 2003, Ben-Dov 1992, Sun 2010).",
  },
  "hollenberg-tager-2000": {
    citation:
      "Hollenberg M, Tager IB. Oxygen uptake efficiency slope: an index of exercise performance and cardiopulmonary reserve requiring only submaximal exercise. J Am Coll Cardiol 2000",
    status: "confirmed",
    doi: "10.1016/S0735-1097(00)00691-4",
    note: "OUES from the first 75% of exercise differed 1.9% from the full-test value.",
  },
});
