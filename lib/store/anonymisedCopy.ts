import "server-only";
import { ENGINE_VERSION, type AnalysisSettings, type TestConduct, type TestRecord } from "../analysis";
import { getDb } from "./db";
import { audit, getTest, latestSettings, saveAnalysisVersion, saveTest } from "./tests";

/** Who a copied threshold override is credited to: the original reviewer's name is not copied. */
export const ANONYMISED_REVIEWER = "a reviewer of the original test";

/** What a copy leaves out, in words, for the form and the audit. */
export const ANONYMISED_COPY_REMOVES = [
  "the uploaded file (its name, its bytes and the details lines above its header)",
  "report versions and signatures",
  "the names of reviewers who set thresholds by hand",
] as const;

/** The free text a copy leaves out unless asked to keep it. */
export const ANONYMISED_COPY_FREE_TEXT = [
  "the test-conduct notes (protocol, reason for stopping, symptoms, blood pressure, ECG notes, notes)",
  "the reasons given for thresholds set by hand",
] as const;

/**
 * Import issues a copy leaves out: they quote the file's details lines or the values that pick one test out of a file
 * holding several (often a patient or study number), or list the other tests' values.
 */
const IDENTIFYING_ISSUE_CODES = new Set(["metadata-found", "record-selected", "several-records"]);

export interface AnonymisedCopyInput {
  /** The copy's label (checked by `labelSchema` before it gets here). */
  label: string;
  /** Copy the free text too (the person making the copy has read it and it names no one). */
  keepFreeText: boolean;
  actor: string;
}

export type AnonymisedCopyResult = { ok: true; id: number } | { ok: false; reason: string };

/** The record without what can identify a patient beyond the measurements: the upload and, unless kept, free text. */
export function anonymisedRecord(record: TestRecord, keepFreeText: boolean): TestRecord {
  const { upload: _upload, conduct, ...rest } = record;
  void _upload;
  const copy: TestRecord = structuredClone(rest);
  if (conduct) {
    const kept: TestConduct = keepFreeText
      ? { ...conduct }
      : (Object.fromEntries(Object.entries(conduct).filter(([, v]) => typeof v !== "string")) as TestConduct);
    if (Object.keys(kept).length) copy.conduct = kept;
  }
  copy.importIssues = copy.importIssues.filter((i) => !IDENTIFYING_ISSUE_CODES.has(i.code));
  return copy;
}

/** The settings of the original's latest analysis, with the reviewers' names (and, unless kept, reasons) replaced. */
export function anonymisedSettings(settings: AnalysisSettings, keepFreeText: boolean): AnalysisSettings {
  const copy = structuredClone(settings);
  if (copy.overrides)
    copy.overrides = copy.overrides.map(({ atIso: _atIso, ...o }) => {
      void _atIso;
      return { ...o, by: ANONYMISED_REVIEWER, reason: keepFreeText ? o.reason : "set by hand on the original test" };
    });
  return copy;
}

/**
 * Make an anonymised copy of an imported test for teaching: a new test with the same breaths, patient measurements
 * (sex, age, height, body mass: the predicted values need them), spirometry, lactate, blood gases and the original's
 * latest analysis settings, so it reads the same numbers; without the uploaded file, report versions, reviewers'
 * names and (unless `keepFreeText`) free text. The original is unchanged; both audit trails say a copy was made, and
 * only the original's names the copy. Refused (nothing written) for a missing or refused test.
 */
export function makeAnonymisedCopy(testId: number, input: AnonymisedCopyInput): AnonymisedCopyResult {
  const db = getDb();
  return db.transaction((): AnonymisedCopyResult => {
    const test = getTest(testId);
    if (!test) return { ok: false, reason: "This test does not exist." };
    if (!test.record) return { ok: false, reason: "A refused upload has no record to copy; make the file usable first." };
    const record = anonymisedRecord(test.record, input.keepFreeText);
    const id = saveTest({
      uploadId: null,
      label: input.label,
      record,
      columns: test.importColumns,
      issues: test.importIssues.filter((i) => !IDENTIFYING_ISSUE_CODES.has(i.code)),
      actor: input.actor,
    });
    const latest = latestSettings(testId);
    if (latest)
      saveAnalysisVersion(
        id,
        anonymisedSettings(latest.settings, input.keepFreeText),
        ENGINE_VERSION,
        input.actor,
        "anonymised copy: the settings of the original test's latest analysis",
      );
    const left = [...ANONYMISED_COPY_REMOVES, ...(input.keepFreeText ? [] : ANONYMISED_COPY_FREE_TEXT)];
    audit(input.actor, "anonymised-copy-created", id, `anonymised copy of another test; left out: ${left.join("; ")}`);
    audit(input.actor, "anonymised-copy-made", testId, `anonymised copy made as test ${id} (“${input.label}”)`);
    return { ok: true, id };
  })();
}
