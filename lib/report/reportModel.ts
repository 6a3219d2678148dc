import type { Issue, Source } from "../core";
import type { ChartSpec } from "./charts/chartSpec";

/**
 * One row of a values table, already formatted for display (numbers are rounded only when they
 * become a ReportRow). Empty optional fields are left out, not shown as "—".
 */
export interface ReportRow {
  label: string;
  /** Formatted value, or "not determinable". */
  value: string;
  unit: string;
  /** Predicted value, formatted, same unit. */
  predicted?: string;
  /** Percent of predicted, formatted without the "%" sign. */
  pctPredicted?: string;
  /** Lower limit of normal, formatted, same unit. */
  lln?: string;
  /** Plain-words method label (from the value's provenance). */
  method: string;
  /** Ids of the sources the value rests on (resolved in `ReportModel.sources`). */
  sourceIds: string[];
  /** Why it is missing, or a reviewer's remark. */
  note?: string;
  /**
   * Thresholds only: the values read at the threshold, formatted with their unit (e.g. label "HR",
   * value "HR 112 bpm"); also written into `note`, kept apart so changes between versions can be named.
   */
  atValues?: { label: string; value: string }[];
}

/**
 * Why a reviewer's own text must be re-read: it was written for an earlier analysis version (other
 * thresholds or settings) and carried into this draft. The report cannot be signed while a
 * section still carries this note; the reviewer clears it by confirming the section was re-checked.
 */
export interface SectionRecheck {
  /** Report version (1-based, per test) and id the reviewer's text was carried from. */
  fromVersion: number;
  fromReportId: number;
  /** Plain-words reason, shown beside the section on the page and in the draft PDF. */
  reason: string;
  /** Reported values that changed since the text was written, e.g. "VT1 (AT): 890 → 1100 mL/min". */
  changes: string[];
  /** The text generated from the current numbers for this section; empty when it is no longer generated. */
  generated: string[];
}

/** An editable block of draft text; paragraphs are plain text (no markup). */
export interface ReportSection {
  /** Stable id, kebab-case, e.g. `summary`. */
  id: string;
  title: string;
  paragraphs: string[];
  /** Set when the text is the reviewer's own, carried from an earlier analysis and not yet re-checked. */
  recheck?: SectionRecheck;
}

/** One step of the interpretation path: which variable was compared with which cut-off, and the outcome. */
export interface ReportPathStep {
  step: number;
  variable: string;
  value: string;
  cutoff: string;
  outcome: string;
  sourceIds: string[];
}

/** One published classification scheme applied (e.g. Weber class), its result and inputs. */
export interface ReportScheme {
  name: string;
  category: string;
  /** Ordinal severity within the scheme, 0 = least severe. */
  severity: number;
  /** Inputs used, formatted, e.g. "peak VO2 14.2 mL/kg/min". */
  inputs: string[];
  /**
   * The scheme's own notes on how it applies here (e.g. "Listing should never rest on peak VO2 alone"), from its data
   * file. Absent from reports signed before notes were printed.
   */
  notes?: string[];
  sourceIds: string[];
}

/**
 * The report as pure display data: everything the page and the PDF show, already formatted. Built
 * from an analysis result by `buildReportModel`; rendered by the report page and `renderReportPdf`.
 */
export interface ReportModel {
  title: string;
  /** Anonymised patient line, e.g. "male, 45 y, 178 cm, 78 kg". */
  patientLine: string;
  /** Test line, e.g. "cycle ergometer, ramp 25 W/min, 13:00 min:s". */
  testLine: string;
  /** Referral question in plain words. */
  referral: string;
  engineVersion: string;
  status: "draft" | "signed";
  signedBy?: string;
  /** The user name of the account the signer was signed in with; absent when the name was typed without log-in. */
  signerAccount?: string;
  /** ISO 8601 time of signature. */
  signedAt?: string;
  /** The attestation the signer confirmed, printed with the signature. */
  attestation?: string;
  /** A signed version that amends an earlier signed one: the version it amends and the signer's reason (kept as signed). */
  amendment?: { revisesVersion: number; reason: string };
  /**
   * The reported values that differ from the signed version this one revises (key values, thresholds, scheme
   * categories), one sentence each (`describeValueChanges`); empty when none differs. Set when the report is loaded,
   * from the two versions' reports as signed, or as now for a draft.
   */
  valueChanges?: { sinceVersion: number; lines: string[] };
  /** Decision-support caution, shown on every page. */
  caution: string;
  /** Draft caution, shown while status is "draft". */
  draftMark: string;
  /**
   * The version's place in the report's history (number, the signed version it revises, a newer version that amends
   * it), shown on the page and in every PDF page header; set when the report is loaded, not kept with the signature.
   */
  versionNote?: string;
  keyValues: ReportRow[];
  thresholds: ReportRow[];
  charts: ChartSpec[];
  /** Editable draft text. */
  sections: ReportSection[];
  path: ReportPathStep[];
  schemes: ReportScheme[];
  issues: Issue[];
  /** Only the sources cited by rows, path steps and schemes, in citation order. */
  sources: Source[];
  /** Methods used, one plain sentence each. */
  methods: string[];
}
