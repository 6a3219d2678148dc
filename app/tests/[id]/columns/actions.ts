"use server";

import crypto from "node:crypto";
import { revalidatePath } from "next/cache";
import { z } from "zod";
import { buildRecord, type TestRecord } from "@/lib/analysis";
import { importBreathFile, parseUnitText, UNIT_KEYS_BY_FIELD, type ColumnMapping, type ColumnOverride } from "@/lib/breath";
import { readTableLayout } from "@/lib/breath/readTableLayout";
import type { Issue } from "@/lib/core";
import { saveProfile } from "@/lib/store/profiles";
import { getImportChoices, getUploadDetails, replaceImport, type ImportChoices } from "@/lib/store/reimport";
import { getTest, getUploadBytes } from "@/lib/store/tests";
import { fieldErrors, plausibleNumber, recordId, stageDurationField, testDetailsSchema } from "../../../schemas";
import { FIELD_LABEL, unitOptions, type FieldKey } from "./fieldChoices";
import { SESSION_NEEDED, currentAccess } from "../../../access";

export interface ColumnFormState {
  ok?: string;
  errors?: Record<string, string>;
  /** What the user sent, re-rendered after a validation error so nothing typed is lost. */
  values?: Record<string, string>;
  /** Problems of a re-read that was not applied. */
  issues?: Issue[];
  /** Changes on every answer so the form re-mounts with the answer's values. */
  stamp?: number;
}

const FIELD_KEYS = Object.keys(FIELD_LABEL) as FieldKey[];

const baseSchema = z.object({
  testId: recordId("test"),
  intent: z.enum(["reread", "save-profile"]),
  weightKg: plausibleNumber("weightKg"),
  stageDurationS: stageDurationField(),
  selectColumn: z.string().max(200).optional().default(""),
  selectValue: z.string().trim().max(200).optional().default(""),
  profileName: z.string().trim().max(80, "Keep the profile name under 80 characters").optional().default(""),
});

const columnChoiceSchema = z.object({
  field: z.enum(["auto", "ignore", ...FIELD_KEYS], { message: "Choose what the column holds" }),
  unit: z.string().max(40).default("auto"),
});

function formValues(form: FormData): Record<string, string> {
  const values: Record<string, string> = {};
  for (const [k, v] of form.entries()) if (typeof v === "string") values[k] = v;
  return values;
}

/**
 * Turn the posted column choices into a mapping (only the columns the user changed from "automatic").
 * A unit chosen with the field left on automatic applies to the field the file gives automatically.
 */
function mappingFromForm(
  headers: readonly string[],
  values: Record<string, string>,
  autoField: (index: number) => FieldKey | null,
): { mapping: ColumnMapping; errors: Record<string, string> } {
  const mapping: ColumnMapping = {};
  const errors: Record<string, string> = {};
  headers.forEach((header, i) => {
    const parsed = columnChoiceSchema.safeParse({
      field: values[`col.${i}.field`] ?? "auto",
      unit: values[`col.${i}.unit`] || "auto",
    });
    if (!parsed.success) {
      errors[`col.${i}`] = `${header}: ${parsed.error.issues[0]?.message ?? "invalid choice"}`;
      return;
    }
    const { field, unit } = parsed.data;
    if (field === "ignore") {
      mapping[header] = { field: null };
      return;
    }
    const target = field === "auto" ? autoField(i) : field;
    if (unit !== "auto") {
      if (target === null) {
        errors[`col.${i}`] = `${header}: choose what the column holds before giving its unit`;
        return;
      }
      const key = parseUnitText(unit);
      const fits =
        unitOptions(target).some((u) => u.value === unit) && key !== undefined && UNIT_KEYS_BY_FIELD[target].includes(key);
      if (!fits) {
        errors[`col.${i}`] = `${header}: ${unit} is not a unit of ${FIELD_LABEL[target]}`;
        return;
      }
    }
    if (field === "auto" && unit === "auto") return;
    const o: ColumnOverride = { field: target };
    if (unit !== "auto") o.unit = unit;
    mapping[header] = o;
  });
  return { mapping, errors };
}

/**
 * Column review form: re-read the kept file with the user's column choices (updating the test, or turning
 * a refused test into an imported one), or save the choices as a named mapping profile.
 */
export async function applyColumnChoices(_prev: ColumnFormState, form: FormData): Promise<ColumnFormState> {
  const values = formValues(form);
  const stamp = Date.now();
  const keep = (errors: Record<string, string>, issues?: Issue[]): ColumnFormState => ({ errors, values, issues, stamp });
  const access = await currentAccess();
  if (!access) return keep({ form: SESSION_NEEDED });
  const base = baseSchema.safeParse(values);
  if (!base.success) return keep(fieldErrors(base.error));
  const { testId, intent, weightKg, stageDurationS, selectColumn, selectValue, profileName } = base.data;
  const stage = stageDurationS !== undefined ? { stageDurationS } : {};
  const test = getTest(testId);
  if (!test) return keep({ form: "This test no longer exists." });
  const stored = test.uploadId ? getUploadBytes(test.uploadId) : null;
  if (!stored) return keep({ form: "The original file of this test is not kept, so it cannot be read again." });
  const bytes = new Uint8Array(stored.bytes);
  const layout = await readTableLayout(bytes, []);
  if (!layout) return keep({ form: "The kept file cannot be read as a table; no column can be mapped." });

  const select = selectColumn && selectValue ? { [selectColumn]: selectValue } : undefined;
  if (selectColumn && !layout.headers.includes(selectColumn)) return keep({ selectValue: "That column is not in the file." });
  const auto = await importBreathFile(bytes, {
    fileName: stored.fileName,
    ...(select ? { select } : {}),
    ...(weightKg !== undefined ? { weightKg } : {}),
    ...stage,
  });
  const autoField = (i: number): FieldKey | null => {
    const c = auto.columns.find((d) => d.index === i);
    return c ? (c.field ?? (c.storedAs ? "vo2MlMin" : null)) : null;
  };
  const { mapping, errors } = mappingFromForm(layout.headers, values, autoField);
  if (Object.keys(errors).length > 0) return keep(errors);

  if (intent === "save-profile") {
    if (!profileName) return keep({ profileName: "Give the profile a name." });
    const saved = saveProfile({ name: profileName, mapping }, access.actor);
    if (!saved.ok) return keep({ profileName: saved.message });
    revalidatePath("/profiles");
    return {
      ok: `Saved as profile "${saved.profile.name}" (${Object.keys(mapping).length} column choice(s)). Pick it on the upload form for the next file of this layout.`,
      values,
      stamp,
    };
  }

  // Re-read. A refused test has no record: its details come from this form, which shows the ones kept with the
  // upload (spirometry and ischaemic heart disease entered with the upload are not on this form and are taken from what
  // was kept).
  const kept = test.record ? null : getUploadDetails(testId);
  let patient: TestRecord["patient"];
  let ergometer: TestRecord["ergometer"];
  let referral: TestRecord["referral"];
  if (test.record) {
    patient = { ...test.record.patient, ...(weightKg !== undefined ? { weightKg } : {}) };
    ergometer = test.record.ergometer;
    referral = test.record.referral;
  } else {
    const d = testDetailsSchema.safeParse(values);
    if (!d.success) return keep(fieldErrors(d.error));
    patient = {
      ...kept?.patient,
      sex: d.data.sex === "" ? undefined : d.data.sex,
      ageY: d.data.ageY,
      heightCm: d.data.heightCm,
      weightKg,
    };
    ergometer = d.data.ergometer;
    referral = d.data.referral;
  }
  const previous = getImportChoices(testId);
  const choices: ImportChoices = {
    mapping,
    ...(select ? { select: { [selectColumn]: selectValue } } : {}),
    ...(weightKg !== undefined ? { weightKg } : {}),
    ...stage,
    ...(previous?.profileName && Object.keys(mapping).length > 0 ? { profileName: previous.profileName } : {}),
  };
  const built = await buildRecord({
    bytes,
    fileName: stored.fileName,
    sha256: crypto.createHash("sha256").update(bytes).digest("hex"),
    patient,
    ergometer,
    referral,
    importOptions: {
      ...(Object.keys(mapping).length > 0 ? { mapping } : {}),
      ...(select ? { select } : {}),
      ...(weightKg !== undefined ? { weightKg } : {}),
      ...stage,
    },
  });
  if (!built.record && test.record)
    return keep(
      { form: "With these choices the file cannot be used (see the problems below); the previous reading is kept unchanged." },
      built.issues,
    );
  // Keep everything entered beside the file (patient, referral, lactate, gases, spirometry, conduct, context).
  const record: TestRecord | null = built.record
    ? test.record
      ? {
          ...test.record,
          patient,
          table: built.record.table,
          columns: built.columns,
          importIssues: built.issues,
          upload: built.record.upload,
        }
      : {
          ...built.record,
          ...(kept?.spirometry ? { spirometry: kept.spirometry } : {}),
          ...(kept?.context ? { context: kept.context } : {}),
        }
    : null;
  replaceImport(testId, { record, columns: built.columns, issues: built.issues, choices, actor: access.actor });
  revalidatePath(`/tests/${testId}`);
  revalidatePath(`/tests/${testId}/columns`);
  if (!record)
    return {
      errors: { form: "The file still cannot be used with these choices; see the problems below." },
      values,
      issues: built.issues,
      stamp,
    };
  const warnings = built.issues.filter((i) => i.severity === "warning").length;
  const check =
    warnings > 0 ? ` ${warnings} warning(s) about the data: read them under "Problems found" before relying on the results.` : "";
  return {
    ok: test.record
      ? `The file was read again with these choices: ${record.table.rows.length} rows. The analysis is recomputed from the new reading.${check}`
      : `The file is now usable: ${record.table.rows.length} rows were read.${check} Open the analysis to review it.`,
    stamp,
  };
}
