"use server";

import { revalidatePath } from "next/cache";
import { redirect } from "next/navigation";
import { makeAnonymisedCopy } from "@/lib/store/anonymisedCopy";
import { z } from "zod";
import { updatePatientDetails } from "@/lib/store/updatePatientDetails";
import { getTest, renameTest } from "@/lib/store/tests";
import { fieldErrors, labelSchema, testDetailsSchema, recordId } from "../../../schemas";
import { changedSince } from "../recordToken";
import { SESSION_NEEDED, currentAccess } from "../../../access";

export interface PatientFormState {
  ok?: string;
  errors?: Record<string, string>;
  /** What the user sent, re-rendered after a validation error so nothing typed is lost. */
  values?: Record<string, string>;
  /** Changes on every answer so the form re-mounts with the answer's values. */
  stamp?: number;
}

/** Same fields, limits (PLAUSIBLE_LIMITS) and messages as the upload form. */
const patientSchema = testDetailsSchema
  .pick({ sex: true, ageY: true, heightCm: true, weightKg: true, ergometer: true, referral: true })
  .extend({ testId: recordId("test") });

/**
 * Correct sex, age, height, weight, ergometer and referral question of a test. The record keeps everything
 * else; an imported test gets a new analysis version (lib/store/updatePatientDetails.ts).
 */
export async function savePatientDetails(_prev: PatientFormState, form: FormData): Promise<PatientFormState> {
  const values: Record<string, string> = {};
  for (const [k, v] of form.entries()) if (typeof v === "string") values[k] = v;
  const stamp = Date.now();
  const access = await currentAccess();
  if (!access) return { errors: { form: SESSION_NEEDED }, values, stamp };
  const parsed = patientSchema.safeParse(values);
  if (!parsed.success) return { errors: fieldErrors(parsed.error), values, stamp };
  const d = parsed.data;
  const stale = changedSince(getTest(d.testId), values.recordToken);
  if (stale) return { errors: { form: stale }, values, stamp };
  const result = updatePatientDetails(
    d.testId,
    {
      sex: d.sex === "" ? undefined : d.sex,
      ageY: d.ageY,
      heightCm: d.heightCm,
      weightKg: d.weightKg,
      ergometer: d.ergometer,
      referral: d.referral,
    },
    access.actor,
  );
  if (!result.ok) return { errors: { [result.field ?? "form"]: result.message }, values, stamp };
  for (const p of ["", "/patient", "/columns", "/report"]) revalidatePath(`/tests/${d.testId}${p}`);
  revalidatePath("/");
  if (result.changes.length === 0) return { ok: "Nothing was changed: the details are the same as before.", stamp };
  return {
    ok:
      result.version !== null
        ? `Saved: ${result.changes.join("; ")}. Analysis version ${result.version} was created with them; predicted values, interpretation and the draft are recomputed.`
        : `Saved: ${result.changes.join("; ")}. They will be used when the file is read successfully.`,
    stamp,
  };
}

export interface LabelFormState {
  ok?: string;
  error?: string;
  /** The label as typed, shown again after a refusal. */
  value?: string;
}

const labelFormSchema = z.object({
  testId: recordId("test"),
  label: labelSchema.pipe(z.string().min(1, "Give a label")),
});

/** Rename a test: its label in the register and its report's title (a signed report keeps the title it was signed with). */
export async function saveLabel(_prev: LabelFormState, form: FormData): Promise<LabelFormState> {
  const value = String(form.get("label") ?? "");
  const access = await currentAccess();
  if (!access) return { error: SESSION_NEEDED, value };
  const parsed = labelFormSchema.safeParse({ testId: form.get("testId"), label: value });
  if (!parsed.success) return { error: parsed.error.issues[0].message, value };
  if (!renameTest(parsed.data.testId, parsed.data.label, access.actor)) return { error: "This test does not exist.", value };
  for (const p of ["", "/patient", "/columns", "/inputs", "/report"]) revalidatePath(`/tests/${parsed.data.testId}${p}`);
  revalidatePath("/");
  return { ok: "Label saved. Reports already signed keep the title they were signed with." };
}

export interface CopyFormState {
  error?: string;
  /** The label and choice as sent, shown again after a refusal. */
  value?: { label: string; keepFreeText: boolean };
}

const copyFormSchema = z.object({
  testId: recordId("test"),
  label: labelSchema.pipe(z.string().min(1, "Give the copy a label that names no one, e.g. “Teaching case 12”")),
  keepFreeText: z.literal("on").optional(),
});

/** Make an anonymised teaching copy of the test (`makeAnonymisedCopy`) and open it. */
export async function makeTeachingCopy(_prev: CopyFormState, form: FormData): Promise<CopyFormState> {
  const value = { label: String(form.get("label") ?? ""), keepFreeText: form.get("keepFreeText") === "on" };
  const access = await currentAccess();
  if (!access) return { error: SESSION_NEEDED, value };
  const parsed = copyFormSchema.safeParse({
    testId: form.get("testId"),
    label: value.label,
    keepFreeText: form.get("keepFreeText") ?? undefined,
  });
  if (!parsed.success) return { error: parsed.error.issues[0].message, value };
  const res = makeAnonymisedCopy(parsed.data.testId, {
    label: parsed.data.label,
    keepFreeText: parsed.data.keepFreeText === "on",
    actor: access.actor,
  });
  if (!res.ok) return { error: res.reason, value };
  revalidatePath("/");
  redirect(`/tests/${res.id}`);
}
