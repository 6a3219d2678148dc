/**
 * Patient details in the store: details entered with a refused upload are kept until the file becomes
 * usable, and a correction after import updates the record, keeps everything else and creates a new
 * analysis version. All files and patients are INVENTED.
 */
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { buildRecord, type TestRecord } from "../../lib/analysis";
import { closeDb } from "../../lib/store/db";
import { getUploadDetails, recordUploadDetails, replaceImport, type UploadDetails } from "../../lib/store/reimport";
import { getTest, listAnalysisVersions, listAudit, saveAnalysisVersion, saveTest } from "../../lib/store/tests";
import { updatePatientDetails } from "../../lib/store/updatePatientDetails";

let dir = "";
beforeEach(() => {
  closeDb();
  dir = fs.mkdtempSync(path.join(os.tmpdir(), "cpet-patient-"));
  process.env.CPET_DB = path.join(dir, "test.sqlite");
});
afterEach(() => {
  closeDb();
  fs.rmSync(dir, { recursive: true, force: true });
});

const enc = (s: string) => new TextEncoder().encode(s);

/** 12 min of invented breaths every 10 s: VO2 400 → 2600 mL/min (or per kg), HR 70 → 166. */
function csv(perKg = false): string {
  const lines = [perKg ? "time_s,vo2_ml_kg_min,vco2_ml_min,ve_l_min,hr_bpm" : "time_s,vo2_ml_min,vco2_ml_min,ve_l_min,hr_bpm"];
  for (let t = 0; t <= 720; t += 10) {
    const vo2 = 400 + (2200 * t) / 720;
    lines.push(
      `${t},${perKg ? (vo2 / 80).toFixed(3) : vo2.toFixed(0)},${(vo2 * 0.95).toFixed(0)},${(vo2 * 0.03).toFixed(1)},${(70 + (96 * t) / 720).toFixed(0)}`,
    );
  }
  return lines.join("\n") + "\n";
}

async function imported(perKg = false): Promise<{ id: number; record: TestRecord }> {
  const built = await buildRecord({
    bytes: enc(csv(perKg)),
    fileName: "invented.csv",
    patient: { sex: "male", ageY: 45, heightCm: 178, weightKg: 80, betaBlocker: true },
    ergometer: "cycle",
    referral: "general",
    importOptions: { weightKg: 80 }, // as the upload form passes the entered weight
  });
  const record: TestRecord = {
    ...built.record!,
    spirometry: { fev1L: 3.9 },
    lactate: [{ timeS: 600, lactateMmolL: 4.1 }],
  } as TestRecord;
  const id = saveTest({ uploadId: null, label: "Invented", record, columns: built.columns, issues: built.issues });
  return { id, record };
}

const details: UploadDetails = Object.freeze({
  patient: Object.freeze({ sex: "female" as const, ageY: 52, heightCm: 165, weightKg: 65 }),
  ergometer: "treadmill" as const,
  referral: "heart-failure" as const,
  spirometry: Object.freeze({ fev1L: 2.6 }),
}) as UploadDetails;

describe("details entered with a refused upload", () => {
  it("are kept with the refused test, survive a re-read that is still refused, and are dropped once the record holds them", async () => {
    const id = saveTest({ uploadId: null, label: "Refused (invented)", record: null, columns: [], issues: [] });
    expect(getUploadDetails(id)).toBeNull();
    recordUploadDetails(id, details);
    expect(getUploadDetails(id)).toEqual(details);
    expect(listAudit(id)[0]).toMatchObject({
      action: "upload-details-kept",
      detail: "female, 52 y, 165 cm, 65 kg, treadmill, heart-failure",
    });
    // still refused after a re-read: the details stay
    replaceImport(id, { record: null, columns: [], issues: [], choices: { mapping: {} }, actor: "tester" });
    expect(getUploadDetails(id)).toEqual(details);
    // usable: the record now holds the details
    const { record } = await imported();
    replaceImport(id, { record, columns: [], issues: [], choices: { mapping: {} }, actor: "tester" });
    expect(getUploadDetails(id)).toBeNull();
  });

  it("are corrected in place for a refused test (no analysis version exists yet)", () => {
    const id = saveTest({ uploadId: null, label: "Refused (invented)", record: null, columns: [], issues: [] });
    recordUploadDetails(id, details);
    const r = updatePatientDetails(
      id,
      { sex: "female", ageY: 53, heightCm: 165, weightKg: 65, ergometer: "treadmill", referral: "heart-failure" },
      "tester",
    );
    expect(r).toEqual({ ok: true, changes: ["age 52 y → 53 y"], version: null });
    expect(getUploadDetails(id)?.patient.ageY).toBe(53);
    expect(getUploadDetails(id)?.spirometry).toEqual({ fev1L: 2.6 });
    expect(listAnalysisVersions(id)).toEqual([]);
  });
});

describe("correcting patient details after import", () => {
  it("updates only the details, keeps the rest of the record and saves a new analysis version with the current settings", async () => {
    const { id, record } = await imported();
    saveAnalysisVersion(id, { peakWindowS: 20 }, "test", "tester", "reviewer settings");
    const r = updatePatientDetails(
      id,
      { sex: "male", ageY: 46, heightCm: 180, weightKg: 80, ergometer: "treadmill", referral: "general" },
      "tester",
    );
    expect(r).toEqual({
      ok: true,
      changes: ["age 45 y → 46 y", "height 178 cm → 180 cm", "ergometer cycle → treadmill"],
      version: 2,
    });
    const t = getTest(id)!;
    expect(t.record!.patient).toEqual({ sex: "male", ageY: 46, heightCm: 180, weightKg: 80, betaBlocker: true });
    expect(t.record!.ergometer).toBe("treadmill");
    // everything else is the same record
    expect(t.record!.table).toEqual(record.table);
    expect(t.record!.spirometry).toEqual({ fev1L: 3.9 });
    expect(t.record!.lactate).toEqual([{ timeS: 600, lactateMmolL: 4.1 }]);
    expect(t.record!.importIssues).toEqual(record.importIssues);
    const versions = listAnalysisVersions(id);
    expect(versions[0]).toMatchObject({ version: 2, settings: { peakWindowS: 20 }, createdBy: "tester" });
    expect(versions[0].note).toBe(
      "patient details changed: age 45 y → 46 y; height 178 cm → 180 cm; ergometer cycle → treadmill",
    );
    expect(listAudit(id)[0]).toMatchObject({ action: "patient-details-changed" });
  });

  it("saving the same details changes nothing and creates no version", async () => {
    const { id } = await imported();
    const r = updatePatientDetails(
      id,
      { sex: "male", ageY: 45, heightCm: 178, weightKg: 80, ergometer: "cycle", referral: "general" },
      "tester",
    );
    expect(r).toEqual({ ok: true, changes: [], version: null });
    expect(listAnalysisVersions(id)).toEqual([]);
  });

  it("clearing a detail makes it 'not given'", async () => {
    const { id } = await imported();
    const r = updatePatientDetails(
      id,
      { ageY: 45, heightCm: 178, weightKg: 80, ergometer: "cycle", referral: "general" },
      "tester",
    );
    expect(r.ok && r.changes).toEqual(["sex male → not given"]);
    expect(getTest(id)!.record!.patient.sex).toBeUndefined();
  });

  it("a per-kg file: VO2 in mL/min follows the new weight, the per-kg plausibility warning is recomputed, and the weight cannot be removed", async () => {
    const { id, record } = await imported(true);
    expect(record.table.vo2PerKg).toBe(true);
    // last row: 2600 / 80 = 32.5 mL/kg/min × 80 kg = 2600 mL/min
    expect(record.table.rows.at(-1)!.vo2MlMin).toBeCloseTo(2600, 6);
    const r = updatePatientDetails(
      id,
      { sex: "male", ageY: 45, heightCm: 178, weightKg: 100, ergometer: "cycle", referral: "general" },
      "tester",
    );
    expect(r.ok).toBe(true);
    // 32.5 mL/kg/min × 100 kg = 3250 mL/min
    expect(getTest(id)!.record!.table.rows.at(-1)!.vo2MlMin).toBeCloseTo(3250, 6);
    const noWeight = updatePatientDetails(
      id,
      { sex: "male", ageY: 45, heightCm: 178, ergometer: "cycle", referral: "general" },
      "tester",
    );
    expect(noWeight).toMatchObject({ ok: false, field: "weightKg" });
    expect(getTest(id)!.record!.patient.weightKg).toBe(100);
  });

  it("an absolute-VO2 file: a lower weight raises the per-kg plausibility warning, a higher one removes it", async () => {
    const { id } = await imported();
    // peak 2600 mL/min ÷ 28 kg = 92.9 mL/kg/min > 90 (the weight is only checked here, not limited: the form applies PLAUSIBLE_LIMITS)
    updatePatientDetails(
      id,
      { sex: "male", ageY: 45, heightCm: 178, weightKg: 28, ergometer: "cycle", referral: "general" },
      "tester",
    );
    const issue = getTest(id)!.record!.importIssues.find((i) => i.code === "beyond-physiological-limit");
    expect(issue?.where?.field).toBe("vo2MlKgMin");
    expect(issue?.message).toContain("above 90 mL/kg/min");
    // 2600 ÷ 80 = 32.5: inside
    updatePatientDetails(
      id,
      { sex: "male", ageY: 45, heightCm: 178, weightKg: 80, ergometer: "cycle", referral: "general" },
      "tester",
    );
    expect(getTest(id)!.record!.importIssues.some((i) => i.code === "beyond-physiological-limit")).toBe(false);
  });

  it("an unknown test is refused with a message", () => {
    expect(updatePatientDetails(424242, { ergometer: "cycle", referral: "general" }, "tester")).toMatchObject({ ok: false });
  });
});
