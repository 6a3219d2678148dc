import { defineSources } from "./source";

/**
 * Sources used across layers. Layer-specific sources live in `lib/<layer>/sources.ts`;
 * `lib/report/sources.ts` merges every registry for display.
 */
export const CORE_SOURCES = defineSources({
  "common-practice": {
    citation: "Common practice in clinical exercise testing (no single published source)",
    status: "common-practice",
  },
  "radtke-2019": {
    citation: "Radtke T et al. ERS statement on standardisation of CPET in chronic lung disease. Eur Respir Rev 2019;28:180101",
    status: "confirmed",
    doi: "10.1183/16000617.0101-2018",
    note: "Table 3 (reference equations) and protocol recommendations seen; other wording recalled.",
  },
  "ats-accp-2003": {
    citation:
      "American Thoracic Society / American College of Chest Physicians. ATS/ACCP Statement on cardiopulmonary exercise testing. Am J Respir Crit Care Med 2003;167:211-277",
    status: "recalled",
    doi: "10.1164/rccm.167.2.211",
    note: "Statement confirmed to exist; its normal-limits table and flow chart were not seen.",
  },
  "robergs-2010": {
    citation:
      "Robergs RA, Dwyer D, Astorino T. Recommendations for improved data processing from expired gas analysis indirect calorimetry. Sports Med 2010;40:95-111",
    status: "confirmed",
    note: "Survey of lab averaging practice (30 s used by 38% of labs).",
  },
});
