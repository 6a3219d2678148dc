/**
 * The decision-support caution shown on every screen and report that shows a number or a finding.
 * Wording is the product's own.
 */
export const CLINICAL_CAUTION =
  "Decision support only. Every value and finding must be reviewed by a qualified clinician; local protocols and licensed practice prevail.";

export const DRAFT_CAUTION = "DRAFT — not a final report until it has been reviewed and signed by a qualified clinician.";
