import "server-only";
import { ENGINE_VERSION, type ReferralQuestion, type TestRecord } from "../analysis";
import { checkPhysiologicalLimits } from "../breath";
import type { Ergometer, Patient } from "../core";
import { getDb } from "./db";
import { getLabDefaults } from "./labSettings";
import { describeDetails, getUploadDetails, recordUploadDetails } from "./reimport";
import { audit, effectiveSettings, getTest, saveAnalysisVersion, updateTestRecord } from "./tests";

/** The details a reviewer may correct after import. Absent patient values mean "not given". */
export interface PatientDetailsChange {
  sex?: Patient["sex"];
  ageY?: number;
  heightCm?: number;
  weightKg?: number;
  ergometer: Ergometer;
  referral: ReferralQuestion;
}

export type PatientDetailsResult =
  { ok: true; changes: string[]; version: number | null } | { ok: false; message: string; field?: keyof PatientDetailsChange };

const show = (v: string | number | undefined, unit = "") => (v === undefined ? "not given" : `${v}${unit}`);

/** What changed, in plain words ("age 45 → 46 y"); empty when nothing did. */
function describeChanges(
  before: { patient: Patient; ergometer: Ergometer; referral: ReferralQuestion },
  after: PatientDetailsChange,
): string[] {
  const out: string[] = [];
  const p = before.patient;
  if (p.sex !== after.sex) out.push(`sex ${show(p.sex)} → ${show(after.sex)}`);
  if (p.ageY !== after.ageY) out.push(`age ${show(p.ageY, " y")} → ${show(after.ageY, " y")}`);
  if (p.heightCm !== after.heightCm) out.push(`height ${show(p.heightCm, " cm")} → ${show(after.heightCm, " cm")}`);
  if (p.weightKg !== after.weightKg) out.push(`weight ${show(p.weightKg, " kg")} → ${show(after.weightKg, " kg")}`);
  if (before.ergometer !== after.ergometer) out.push(`ergometer ${before.ergometer} → ${after.ergometer}`);
  if (before.referral !== after.referral) out.push(`referral ${before.referral} → ${after.referral}`);
  return out;
}

/**
 * Correct a test's patient details (sex, age, height, weight), ergometer and referral question after import.
 * Everything else in the record (breaths, lactate, gases, spirometry, conduct, context, other patient fields)
 * is kept. For an imported test the record is updated and a new analysis version is saved with the test's
 * current settings and a note saying what changed, so the analysis and any draft are recomputed and the old
 * version stays listed (as for a threshold override); the audit trail names who changed what.
 * When the file gives VO2 per kg, VO2 in mL/min is recomputed with the new body mass, and the import's
 * physiological-plausibility warnings are recomputed for the new body mass.
 * For a refused test the details kept with its upload are updated instead (no analysis exists yet).
 * Values are validated by the caller (app/schemas.ts, PLAUSIBLE_LIMITS); this function refuses only what the
 * record itself rules out (removing the body mass of a per-kg file).
 */
export function updatePatientDetails(testId: number, change: PatientDetailsChange, actor: string): PatientDetailsResult {
  const test = getTest(testId);
  if (!test) return { ok: false, message: "This test no longer exists." };
  const record = test.record;
  if (!record) {
    const kept = getUploadDetails(testId);
    const before = kept ?? { patient: {}, ergometer: "cycle" as Ergometer, referral: "general" as ReferralQuestion };
    const changes = describeChanges(before, change);
    if (changes.length === 0) return { ok: true, changes, version: null };
    const details = {
      ...before,
      patient: { ...before.patient, ...patientPart(change) },
      ergometer: change.ergometer,
      referral: change.referral,
    };
    recordUploadDetails(testId, details, actor);
    audit(
      actor,
      "patient-details-changed",
      testId,
      `${changes.join("; ")} (kept until the file is usable: ${describeDetails(details)})`,
    );
    return { ok: true, changes, version: null };
  }

  const changes = describeChanges(record, change);
  if (changes.length === 0) return { ok: true, changes, version: null };
  if (record.table.vo2PerKg && change.weightKg === undefined)
    return {
      ok: false,
      field: "weightKg",
      message: "This file gives VO2 per kg of body mass, so the weight cannot be removed: VO2 in mL/min is computed from it.",
    };
  const next: TestRecord = {
    ...record,
    patient: { ...record.patient, ...patientPart(change) },
    ergometer: change.ergometer,
    referral: change.referral,
  };
  if (change.weightKg !== record.patient.weightKg) {
    const w = change.weightKg;
    if (record.table.vo2PerKg && w !== undefined) {
      next.table = {
        ...record.table,
        rows: record.table.rows.map((r) => (r.vo2MlKgMin !== undefined ? { ...r, vo2MlMin: r.vo2MlKgMin * w } : r)),
      };
    }
    next.importIssues = recheckLimits(next);
  }
  const settings = effectiveSettings(testId, getLabDefaults());
  let version = 0;
  getDb().transaction(() => {
    const note = `patient details changed: ${changes.join("; ")}`;
    // a new analysis version pins the corrected record (the first one when the test was never analysed)
    version = updateTestRecord(testId, next, actor, note) ?? saveAnalysisVersion(testId, settings, ENGINE_VERSION, actor, note);
    audit(actor, "patient-details-changed", testId, changes.join("; "));
  })();
  return { ok: true, changes, version };
}

function patientPart(c: PatientDetailsChange): Patient {
  return { sex: c.sex, ageY: c.ageY, heightCm: c.heightCm, weightKg: c.weightKg };
}

/** Import issues with the physiological-plausibility warnings recomputed for the record's current body mass. */
function recheckLimits(record: TestRecord) {
  const header = (f: string) => record.columns.find((c) => c.field === f)?.header;
  const perKgHeader = record.columns.find((c) => c.storedAs === "vo2MlKgMin")?.header;
  const fresh = checkPhysiologicalLimits(record.table.rows, {
    shape: record.table.shape,
    ...(record.patient.weightKg !== undefined ? { weightKg: record.patient.weightKg } : {}),
    headers: {
      vo2MlMin: header("vo2MlMin") ?? perKgHeader,
      vo2MlKgMin: perKgHeader ?? header("vo2MlMin"),
      veLMin: header("veLMin"),
      hrBpm: header("hrBpm"),
    },
  });
  const kept = record.importIssues.filter((i) => i.code !== "beyond-physiological-limit" && i.code !== "short-recording");
  return [...kept, ...fresh];
}
