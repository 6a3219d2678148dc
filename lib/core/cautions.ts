/**
 * The product's cautions, in its own words, used by every layer that shows or writes a number or a
 * finding (pages, PDF, CLI, composed draft text).
 */
export const CLINICAL_CAUTION =
  "Decision support only. Every value and finding must be reviewed by a qualified clinician; local protocols and licensed practice prevail.";

/** Shown on every draft (page, PDF page, composed text) until a clinician signs it. */
export const DRAFT_CAUTION = "DRAFT — not a final report until it has been reviewed and signed by a qualified clinician.";
