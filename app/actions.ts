"use server";

import { redirect } from "next/navigation";
import { buildRecord } from "@/lib/analysis";
import { getProfile } from "@/lib/store/profiles";
import { recordImportChoices, recordUploadDetails } from "@/lib/store/reimport";
import { getUploadBytes, saveTest, saveUpload } from "@/lib/store/tests";
import { fieldErrors, stageDurationField, testDetailsSchema, uploadFileProblem } from "./schemas";
import { formatUtcMinute } from "@/lib/units";
import { SESSION_NEEDED, currentAccess } from "./access";

/** The upload's details, and the stage length for a stage table without a time column (as on the columns page). */
const uploadDetailsSchema = testDetailsSchema.extend({
  stageDurationS: stageDurationField(),
});

export interface UploadState {
  errors?: Record<string, string>;
  /** The file is kept on the server even when the details need fixing. */
  uploadId?: number;
  fileName?: string;
  /**
   * Every string field as submitted (text, number, select, checked checkbox and radio values), so a refused upload
   * shows the form exactly as the user left it.
   */
  values?: Record<string, string>;
  /** Counts the refused submissions; the form is rebuilt from `values` each time it changes. */
  attempt?: number;
}

/**
 * A browser sends a file input with nothing chosen as an empty file part with an empty file name. A plain form post
 * reads back as a file named "", a post from the page's script as one named "undefined" (the multipart reader drops
 * the empty name and Node names such a file "undefined"). A chosen file always has a name, so an empty one is refused
 * as empty (`uploadFileProblem`).
 */
const nothingChosen = (file: File) => file.size === 0 && (file.name === "" || file.name === "undefined");

export async function uploadTest(prev: UploadState, form: FormData): Promise<UploadState> {
  const values: Record<string, string> = {};
  for (const [k, v] of form.entries()) if (typeof v === "string") values[k] = v;
  const attempt = (prev?.attempt ?? 0) + 1;
  // nothing is kept from a request without a session (the file is chosen again after signing in)
  const access = await currentAccess();
  if (!access) return { errors: { file: SESSION_NEEDED }, values, attempt };

  // 1. Keep the file first, whatever else is wrong, so nothing the user sent is lost.
  let uploadId = values.uploadId ? Number(values.uploadId) : undefined;
  let fileName = values.uploadFileName || undefined;
  // a file kept from an earlier submit stays kept when a newly chosen one is refused
  const kept = uploadId ? { uploadId, fileName } : {};
  const file = form.get("file");
  if (file instanceof File && !nothingChosen(file)) {
    // the same words as the browser's check (app/schemas.ts); the server-action body limit sits above this one
    const problem = uploadFileProblem(file);
    if (problem) return { errors: { file: problem }, ...kept, values, attempt };
    const bytes = new Uint8Array(await file.arrayBuffer());
    uploadId = saveUpload(file.name, bytes).id;
    fileName = file.name;
  }
  if (!uploadId) return { errors: { file: "Choose a breath-by-breath or stage file to upload." }, values, attempt };

  // 2. Validate the details; on failure the kept file is reused on the next submit.
  const parsed = uploadDetailsSchema.safeParse(values);
  if (!parsed.success) return { errors: fieldErrors(parsed.error), uploadId, fileName, values, attempt };
  const d = parsed.data;
  // Mapping profile picked on the form: its column choices are applied as "set by user".
  const profile = values.profile ? getProfile(values.profile) : null;
  if (values.profile && !profile)
    return {
      errors: { profile: `There is no mapping profile named "${values.profile}".` },
      uploadId,
      fileName,
      values,
      attempt,
    };

  const stored = getUploadBytes(uploadId);
  if (!stored) return { errors: { file: "The kept file could not be found; upload it again." }, values, attempt };
  const bytes = new Uint8Array(stored.bytes);
  const patient = {
    sex: d.sex === "" ? undefined : d.sex,
    ageY: d.ageY,
    heightCm: d.heightCm,
    weightKg: d.weightKg,
  };
  const spirometry = d.fev1L !== undefined || d.mvvLMin !== undefined ? { fev1L: d.fev1L, mvvLMin: d.mvvLMin } : undefined;
  const context = d.ischaemicHeartDisease ? { ischaemicHeartDisease: d.ischaemicHeartDisease === "yes" } : undefined;
  const built = await buildRecord({
    bytes,
    fileName: stored.fileName,
    patient,
    ergometer: d.ergometer,
    referral: d.referral,
    importOptions: {
      ...(profile ? { mapping: profile.mapping } : {}),
      ...(d.weightKg !== undefined ? { weightKg: d.weightKg } : {}),
      ...(d.stageDurationS !== undefined ? { stageDurationS: d.stageDurationS } : {}),
    },
  });
  if (built.record && spirometry) built.record.spirometry = spirometry;
  if (built.record && context) built.record.context = { ...built.record.context, ...context };
  const id = saveTest({
    uploadId,
    // without a label the register names the test by its upload time, not by the file name, which often holds the
    // patient's name, birth date or number (the file name stays on the test's own pages for the physiologist)
    label: d.label || `Test uploaded ${formatUtcMinute(new Date().toISOString())}`,
    record: built.record,
    columns: built.columns,
    issues: built.issues,
    actor: access.actor,
  });
  // A refused file has no record to hold the details entered with it: keep them for when it becomes usable.
  if (!built.record)
    recordUploadDetails(
      id,
      {
        patient,
        ergometer: d.ergometer,
        referral: d.referral,
        ...(spirometry ? { spirometry } : {}),
        ...(context ? { context } : {}),
      },
      access.actor,
    );
  // the choices the file was read with, so a re-read on the columns page starts from them
  if (profile || d.stageDurationS !== undefined)
    recordImportChoices(
      id,
      {
        mapping: profile?.mapping ?? {},
        ...(profile ? { profileName: profile.name } : {}),
        weightKg: d.weightKg,
        ...(d.stageDurationS !== undefined ? { stageDurationS: d.stageDurationS } : {}),
      },
      access.actor,
    );
  redirect(`/tests/${id}`);
}
