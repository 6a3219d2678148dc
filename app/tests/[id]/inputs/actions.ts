"use server";

import { revalidatePath } from "next/cache";
import type { TestRecord } from "@/lib/analysis";
import { importBloodGasFile, importLactateFile, parseSpirometry } from "@/lib/breath";
import type { Issue } from "@/lib/core";
import { audit, getTest, saveUpload, updateTestRecord } from "@/lib/store/tests";
import { fieldErrors } from "../../../schemas";
import { changedSince } from "../recordToken";
import { conductSchema, contextSchema, fileFormSchema } from "./schemas";
import { SESSION_NEEDED, currentAccess, type Access } from "../../../access";

export interface InputFormState {
  ok?: string;
  errors?: Record<string, string>;
  /** What the user sent, re-rendered after a validation error so nothing typed is lost. */
  values?: Record<string, string>;
  issues?: Issue[];
  /** Changes on every answer so the form re-mounts with the answer's values. */
  stamp?: number;
}

/** `Issue.where.field` of the notes kept from the last lactate file read. */
const LACTATE_FILE_FIELD = "lactateFile";
const MAX_BYTES = 5 * 1024 * 1024;

function formValues(form: FormData): Record<string, string> {
  const values: Record<string, string> = {};
  for (const [k, v] of form.entries()) if (typeof v === "string") values[k] = v;
  return values;
}

function loadRecord(testId: number): TestRecord | null {
  return getTest(testId)?.record ?? null;
}

/** The test's record and, read from the same row, why a save from this page is refused when it showed an older one. */
function loadForSave(testId: number, sentToken: unknown): { record: TestRecord | null; stale: string | null } {
  const test = getTest(testId);
  return { record: test?.record ?? null, stale: changedSince(test, sentToken) };
}

function done(testId: number, record: TestRecord, action: string, detail: string, actor: string): void {
  // a new analysis version pins the changed inputs; a report already signed keeps the record it was signed on
  updateTestRecord(testId, record, actor, `${action.replace(/-/g, " ")}: ${detail}`);
  audit(actor, action, testId, detail);
  revalidatePath(`/tests/${testId}`);
  revalidatePath(`/tests/${testId}/inputs`);
  revalidatePath(`/tests/${testId}/report`);
}

async function readFile(form: FormData): Promise<{ name: string; bytes: Uint8Array } | { error: string }> {
  const file = form.get("file");
  if (!(file instanceof File) || file.size === 0) return { error: "Choose a file to upload." };
  if (file.size > MAX_BYTES) return { error: "The file is larger than 5 MB; it cannot be a sample list." };
  return { name: file.name, bytes: new Uint8Array(await file.arrayBuffer()) };
}

/**
 * Shared path of the sample-file forms: validate, load the record, read the kept file, import its
 * samples, and on success store the upload and the updated record. Nothing changes when no sample is read.
 */
async function addSampleFile<S>(
  access: Access,
  form: FormData,
  what: string,
  importSamples: (
    bytes: Uint8Array,
    timeUnit: "s" | "min" | undefined,
    form: { lactateUnit: "" | "mmol/L" | "mg/dL" },
  ) => Promise<{ samples: S[]; issues: Issue[] }>,
  apply: (record: TestRecord, samples: S[], issues: Issue[]) => TestRecord,
  action: string,
): Promise<InputFormState> {
  const values = formValues(form);
  const stamp = Date.now();
  const parsed = fileFormSchema.safeParse(values);
  if (!parsed.success) return { errors: fieldErrors(parsed.error), values, stamp };
  const record = loadRecord(parsed.data.testId);
  if (!record) return { errors: { form: "This test has no usable breath data yet." }, values, stamp };
  const file = await readFile(form);
  if ("error" in file) return { errors: { file: file.error }, values, stamp };
  const { samples, issues } = await importSamples(file.bytes, parsed.data.timeUnit, parsed.data);
  if (samples.length === 0)
    return { errors: { file: `No ${what} samples could be read from this file; nothing was changed.` }, issues, values, stamp };
  const upload = saveUpload(file.name, file.bytes);
  done(
    parsed.data.testId,
    apply(record, samples, issues),
    action,
    `${samples.length} sample(s) from ${file.name} (upload ${upload.id})`,
    access.actor,
  );
  return { ok: `${samples.length} ${what} sample(s) saved from ${file.name}.`, issues, values, stamp };
}

/** Blood lactate samples from a file (importLactateFile); replaces the test's lactate samples. The file is kept. */
export async function addLactateFile(_prev: InputFormState, form: FormData): Promise<InputFormState> {
  const access = await currentAccess();
  if (!access) return { errors: { form: SESSION_NEEDED }, values: formValues(form), stamp: Date.now() };
  return addSampleFile(
    access,
    form,
    "lactate",
    (bytes, timeUnit, { lactateUnit }) => importLactateFile(bytes, { timeUnit, ...(lactateUnit ? { lactateUnit } : {}) }),
    // the reading's notes (samples left out, unit read from the values) stay with the record, as the CLI keeps them, so
    // the analysis lists them after the upload too; a new file replaces the last file's notes
    (record, lactate, issues) => ({
      ...record,
      lactate,
      importIssues: [
        ...record.importIssues.filter((i) => i.where?.field !== LACTATE_FILE_FIELD),
        ...issues.map((i) => ({ ...i, where: { ...i.where, field: LACTATE_FILE_FIELD } })),
      ],
    }),
    "lactate-added",
  );
}

/**
 * Arterial blood gases from a file (importBloodGasFile, plain-number times in the unit chosen on the form); replaces the
 * test's blood gases. The file is kept.
 */
export async function addBloodGasFile(_prev: InputFormState, form: FormData): Promise<InputFormState> {
  const access = await currentAccess();
  if (!access) return { errors: { form: SESSION_NEEDED }, values: formValues(form), stamp: Date.now() };
  return addSampleFile(
    access,
    form,
    "blood gas",
    (bytes, timeUnit) => importBloodGasFile(bytes, { timeUnit }),
    (record, bloodGases) => ({ ...record, bloodGases }),
    "blood-gases-added",
  );
}

/** Names of the entered details, as the analysis-version list shows them. */
const DETAIL_LABEL: Record<string, string> = {
  fev1L: "FEV1 (L)",
  fvcL: "FVC (L)",
  mvvLMin: "MVV (L/min)",
  fev1PctPred: "FEV1 (% predicted)",
  dlcoPctPred: "DLCO (% predicted)",
  ischaemicHeartDisease: "ischaemic heart disease",
  resectedSegments: "segments to be resected",
  stairClimbM: "stair climb (m)",
  shuttleWalkM: "shuttle walk (m)",
  betaBlocker: "beta-blocker",
  atrialFibrillation: "atrial fibrillation",
};

/** "FEV1 (L) 3.2; beta-blocker yes": the entered details in words for the version note (not JSON). */
function detailWords(details: object): string {
  return Object.entries(details)
    .filter(([, v]) => v !== undefined && v !== null)
    .map(([k, v]) => `${DETAIL_LABEL[k] ?? k} ${v === true ? "yes" : v === false ? "no" : String(v)}`)
    .join("; ");
}

/** Resting spirometry (parseSpirometry). Any implausible value refuses the whole form, keeping what was typed. */
export async function saveSpirometry(_prev: InputFormState, form: FormData): Promise<InputFormState> {
  const values = formValues(form);
  const stamp = Date.now();
  const access = await currentAccess();
  if (!access) return { errors: { form: SESSION_NEEDED }, values, stamp };
  const testId = Number(values.testId);
  const { record, stale } = Number.isInteger(testId) ? loadForSave(testId, values.recordToken) : { record: null, stale: null };
  if (!record) return { errors: { form: "This test has no usable breath data yet." }, values, stamp };
  if (stale) return { errors: { form: stale }, values, stamp };
  const { spirometry, issues } = parseSpirometry({
    fev1L: values.fev1L,
    fvcL: values.fvcL,
    mvvLMin: values.mvvLMin,
    fev1PctPred: values.fev1PctPred,
    dlcoPctPred: values.dlcoPctPred,
  });
  const problems = issues.filter((i) => i.severity !== "info");
  if (problems.length > 0) {
    // the form is refused whole: nothing is "left out" and the rest saved, so the field says what is wrong and the form
    // says nothing was saved
    const errors: Record<string, string> = { form: "Nothing was saved: correct the value marked below and save again." };
    for (const i of problems) errors[String(i.where?.field ?? "form")] ??= i.message.replace(/; it was left out\.$/, ".");
    return { errors, values, stamp };
  }
  const next: TestRecord = { ...record };
  if (spirometry) next.spirometry = spirometry;
  else delete next.spirometry;
  done(testId, next, "spirometry-updated", spirometry ? detailWords(spirometry) : "cleared", access.actor);
  return { ok: spirometry ? "Spirometry saved; the breathing reserve is recomputed." : "Spirometry cleared.", stamp };
}

/** Clinical context (record.context) with beta-blocker and haemoglobin (record.patient). */
export async function saveContext(_prev: InputFormState, form: FormData): Promise<InputFormState> {
  const values = formValues(form);
  const stamp = Date.now();
  const access = await currentAccess();
  if (!access) return { errors: { form: SESSION_NEEDED }, values, stamp };
  const parsed = contextSchema.safeParse(values);
  if (!parsed.success) return { errors: fieldErrors(parsed.error), values, stamp };
  const c = parsed.data;
  const { record, stale } = loadForSave(c.testId, values.recordToken);
  if (!record) return { errors: { form: "This test has no usable breath data yet." }, values, stamp };
  if (stale) return { errors: { form: stale }, values, stamp };
  const yn = (x: "" | "yes" | "no") => (x === "" ? undefined : x === "yes");
  const context = {
    ischaemicHeartDisease: yn(c.ischaemicHeartDisease),
    resectedSegments: c.resectedSegments,
    stairClimbM: c.stairClimbM,
    shuttleWalkM: c.shuttleWalkM,
  };
  const patient = {
    ...record.patient,
    betaBlocker: yn(c.betaBlocker),
    atrialFibrillation: yn(c.atrialFibrillation),
    haemoglobinGDl: c.haemoglobinGDl,
  };
  const next: TestRecord = { ...record, context: dropUndefined(context), patient: dropUndefined(patient) };
  done(
    c.testId,
    next,
    "clinical-context-updated",
    detailWords({ ...next.context, betaBlocker: patient.betaBlocker, atrialFibrillation: patient.atrialFibrillation }) ||
      "cleared",
    access.actor,
  );
  return { ok: "Clinical context saved; the interpretation is recomputed.", stamp };
}

/** How the test was conducted (record.conduct). */
export async function saveConduct(_prev: InputFormState, form: FormData): Promise<InputFormState> {
  const values = formValues(form);
  const stamp = Date.now();
  const access = await currentAccess();
  if (!access) return { errors: { form: SESSION_NEEDED }, values, stamp };
  const parsed = conductSchema.safeParse(values);
  if (!parsed.success) return { errors: fieldErrors(parsed.error), values, stamp };
  const { testId, ...c } = parsed.data;
  const { record, stale } = loadForSave(testId, values.recordToken);
  if (!record) return { errors: { form: "This test has no usable breath data yet." }, values, stamp };
  if (stale) return { errors: { form: stale }, values, stamp };
  const conduct = dropUndefined({
    protocol: c.protocol || undefined,
    reasonForStopping: c.reasonForStopping || undefined,
    symptoms: c.symptoms || undefined,
    peakBorg: c.peakBorg,
    bloodPressure: c.bloodPressure || undefined,
    ecgNotes: c.ecgNotes || undefined,
    notes: c.notes || undefined,
    apparatusDeadSpaceMl: c.apparatusDeadSpaceMl,
    barometricPressureMmHg: c.barometricPressureMmHg,
  });
  done(testId, { ...record, conduct }, "test-conduct-updated", Object.keys(conduct).join(", ") || "cleared", access.actor);
  return { ok: "Test conduct saved.", stamp };
}

function dropUndefined<T extends object>(o: T): T {
  return Object.fromEntries(Object.entries(o).filter(([, v]) => v !== undefined)) as T;
}
