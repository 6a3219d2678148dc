"use server";

import { revalidatePath } from "next/cache";
import { z } from "zod";
import type { AnalysisSettings, TestRecord } from "@/lib/analysis";
import { analyse, checkThresholdOverride, ENGINE_VERSION } from "@/lib/analysis";
import { parseSignedTimeText, parseTimeText, type BreathTable } from "@/lib/breath";
import { conditionTable, exerciseShareSetAside } from "@/lib/signal";
import { getLabDefaults } from "@/lib/store/labSettings";
import { formatClock } from "@/lib/units";
import { effectiveSettings, getTest, latestSettings, saveAnalysisVersion } from "@/lib/store/tests";
import { settingsChangedSince } from "./recordToken";
import { VO2_CHECKS } from "./vo2Checks";
import { recordId } from "../../schemas";
import { SESSION_NEEDED, actionAccess, currentAccess, type Access } from "../../access";

/** Where a form without typed text sends a user whose session ended: back to the test after signing in. */
const testPath = (form: FormData) => {
  const id = Number(form.get("testId"));
  return Number.isInteger(id) && id > 0 ? `/tests/${id}` : "/";
};

/**
 * Signed in, the reviewer named in an override, a set-aside or a VO2 check is the account's display name, whatever the
 * form sends (the page shows it and sends it; a crafted form cannot name someone else).
 */
function signedInAs(access: Access, values: Record<string, string>): void {
  if (access.mode === "account") values.by = access.account.displayName;
}

/** Who a new analysis version is by: the signed-in account, or without log-in the name typed on the form. */
const actorFor = (access: Access, typed: string) => (access.mode === "account" ? access.actor : typed);

export interface FormState {
  ok?: string;
  errors?: Record<string, string>;
  values?: Record<string, string>;
  /** When the answer was made: a form that keeps unsaved values (`useKeptForm`) starts again from each answer. */
  stamp?: number;
}

const overrideSchema = z
  .object({
    testId: recordId("test"),
    which: z.enum(["vt1", "vt2"]),
    vo2MlMin: z.preprocess(
      (v) => (v === "" ? undefined : Number(v)),
      z
        .number({ message: "VO2 must be a number (mL/min)" })
        .min(100, "VO2 must be at least 100 mL/min")
        .max(8000, "VO2 must be at most 8000 mL/min")
        .optional(),
    ),
    time: z
      .string()
      .trim()
      .optional()
      .refine((t) => !t || Number.isFinite(parseTimeText(t)), "Time as m:ss or seconds"),
    reason: z.string().trim().min(5, "Give the reason for the override (at least a few words)").max(500),
    by: z.string().trim().min(2, "Say who is making the override").max(80),
  })
  .refine((o) => o.vo2MlMin !== undefined || (o.time !== undefined && o.time !== ""), {
    message: "Give the threshold's VO2 or its time",
    path: ["vo2MlMin"],
  })
  // one of the two: the engine reads the other from the ramp, so a second value would be silently ignored
  .refine((o) => !(o.vo2MlMin !== undefined && o.time !== undefined && o.time !== ""), {
    message: "Give the VO2 or the time, not both (the other is read from the test)",
    path: ["vo2MlMin"],
  });

function formValues(form: FormData): Record<string, string> {
  const values: Record<string, string> = {};
  for (const [k, v] of form.entries()) if (typeof v === "string") values[k] = v;
  return values;
}

function errorsOf(error: z.ZodError): Record<string, string> {
  const out: Record<string, string> = {};
  for (const i of error.issues) out[String(i.path[0] ?? "form")] ??= i.message;
  return out;
}

/** A reviewer's threshold override is a new settings version; everything dependent is recomputed. */
export async function overrideThreshold(_prev: FormState, form: FormData): Promise<FormState> {
  const values = formValues(form);
  const access = await currentAccess();
  if (!access) return { errors: { form: SESSION_NEEDED }, values };
  signedInAs(access, values);
  const parsed = overrideSchema.safeParse(values);
  if (!parsed.success) return { errors: errorsOf(parsed.error), values };
  const o = parsed.data;
  const record = getTest(o.testId)?.record;
  if (!record) return { errors: { form: "This test has no usable data." }, values };
  const stale = settingsChangedSince(o.testId, values.versionToken);
  if (stale) return { errors: { form: stale }, values };
  const timeS = o.time ? parseTimeText(o.time) : undefined;
  const current = effectiveSettings(o.testId, getLabDefaults());
  // refuse a threshold the test cannot have (outside exercise, above peak VO2, VT1 not below VT2)
  const problems = checkThresholdOverride(analyse(record, current), {
    which: o.which,
    timeS,
    vo2MlMin: timeS === undefined ? o.vo2MlMin : undefined,
  });
  if (problems.length > 0)
    return { errors: { [timeS === undefined ? "vo2MlMin" : "time"]: problems.map((p) => p.message).join(" ") }, values };
  const others = (current.overrides ?? []).filter((x) => x.which !== o.which);
  const settings: AnalysisSettings = {
    ...current,
    overrides: [
      ...others,
      {
        which: o.which,
        vo2MlMin: timeS === undefined ? o.vo2MlMin : undefined,
        timeS,
        reason: o.reason,
        by: o.by,
        atIso: new Date().toISOString(),
      },
    ],
  };
  saveAnalysisVersion(
    o.testId,
    settings,
    ENGINE_VERSION,
    actorFor(access, o.by),
    `${o.which.toUpperCase()} override: ${o.reason}`,
  );
  revalidatePath(`/tests/${o.testId}`);
  return { ok: `${o.which.toUpperCase()} override saved as a new analysis version; all dependent values were recomputed.` };
}

const clearOverrideSchema = z.object({
  testId: recordId("test"),
  which: z.enum(["vt1", "vt2"]),
  reason: z.string().trim().min(3).max(200),
  by: z.string().trim().min(2).max(80),
});

/**
 * Remove a reviewer's threshold override, with why and who did it (as setting one asks): a new settings version. A page
 * opened before another change removes nothing.
 */
export async function clearOverride(form: FormData): Promise<void> {
  const access = await actionAccess(testPath(form));
  const values = formValues(form);
  signedInAs(access, values);
  const parsed = clearOverrideSchema.safeParse(values);
  if (!parsed.success || settingsChangedSince(parsed.data.testId, values.versionToken)) return;
  const { testId, which, reason, by } = parsed.data;
  const current = latestSettings(testId)?.settings;
  if (!current?.overrides?.some((x) => x.which === which)) return;
  saveAnalysisVersion(
    testId,
    { ...current, overrides: current.overrides.filter((x) => x.which !== which) },
    ENGINE_VERSION,
    actorFor(access, by),
    `${which.toUpperCase()} override removed (the automatic estimate is used again): ${reason}, by ${by}`,
  );
  revalidatePath(`/tests/${testId}`);
}

const averagingOptions = {
  none: { kind: "none", label: "breath by breath (no averaging)" },
  "rolling-30": { kind: "rolling-time", seconds: 30, label: "30-s rolling time window" },
  "bin-10": { kind: "time-bin", seconds: 10, label: "10-s time bins" },
  "bin-20": { kind: "time-bin", seconds: 20, label: "20-s time bins" },
  "bin-30": { kind: "time-bin", seconds: 30, label: "30-s time bins" },
  "breaths-7": { kind: "breath-count", breaths: 7, label: "7-breath rolling average" },
  "middle-5-of-7": { kind: "middle-of-seven", breaths: 7, label: "middle 5 of 7 breaths" },
} as const;
export type AveragingKey = keyof typeof averagingOptions;

const settingsSchema = z.object({
  testId: recordId("test"),
  averaging: z.enum(Object.keys(averagingOptions) as [AveragingKey, ...AveragingKey[]]),
  peakWindowS: z.coerce.number().refine((n) => [15, 20, 30, 60].includes(n), "Peak window must be 15, 20, 30 or 60 s"),
  vo2Equation: z.string().min(1),
  hrEquation: z.string().min(1),
  mvvChoice: z.enum(["auto", "measured", "fev1x40", "fev1x35"]),
  note: z.string().trim().max(300).optional(),
});

/** Lab and reviewer choices: a new settings version (old ones are kept and listed). */
export async function saveSettings(_prev: FormState, form: FormData): Promise<FormState> {
  const values = formValues(form);
  const access = await currentAccess();
  if (!access) return { stamp: Date.now(), errors: { form: SESSION_NEEDED }, values };
  signedInAs(access, values);
  const parsed = settingsSchema.safeParse(values);
  if (!parsed.success) return { stamp: Date.now(), errors: errorsOf(parsed.error), values };
  const s = parsed.data;
  const test = getTest(s.testId);
  if (!test?.record) return { stamp: Date.now(), errors: { form: "This test has no usable data." }, values };
  const stale = settingsChangedSince(s.testId, values.versionToken);
  if (stale) return { stamp: Date.now(), errors: { form: stale }, values };
  const erg = test.record.ergometer;
  const current = effectiveSettings(s.testId, getLabDefaults());
  const choices: Record<string, string> = {};
  for (const [k, v] of Object.entries(values)) if (k.startsWith("choice:") && v) choices[k.slice(7)] = v;
  const settings: AnalysisSettings = {
    ...current,
    conditioning: { ...current.conditioning, averaging: { ...averagingOptions[s.averaging] } },
    peakWindowS: s.peakWindowS,
    mvvChoice: s.mvvChoice === "auto" ? undefined : s.mvvChoice,
    labSettings: {
      equations: {
        ...current.labSettings?.equations,
        vo2PeakMlMin: { ...current.labSettings?.equations?.vo2PeakMlMin, [erg]: s.vo2Equation },
        hrMaxBpm: { ...current.labSettings?.equations?.hrMaxBpm, [erg]: s.hrEquation },
      },
    },
    interpret: { ...current.interpret, choices },
  };
  saveAnalysisVersion(s.testId, settings, ENGINE_VERSION, access.actor, s.note || "settings changed");
  revalidatePath(`/tests/${s.testId}`);
  return { stamp: Date.now(), ok: "Settings saved as a new analysis version." };
}

const clockOrSeconds = (what: string) =>
  z
    .string()
    .trim()
    .min(1, `Give the ${what} as m:ss or seconds`)
    .refine((t) => Number.isFinite(parseSignedTimeText(t)), `${what} as m:ss or seconds (a minus for times before 0:00)`)
    .transform(parseSignedTimeText);

const exerciseSpanSchema = z
  .object({
    testId: recordId("test"),
    start: clockOrSeconds("Start"),
    end: clockOrSeconds("End"),
    reason: z.string().trim().min(5, "Give the reason (at least a few words)").max(300),
    by: z.string().trim().min(2, "Say who is setting the phase").max(80),
  })
  .refine((o) => o.end > o.start, { message: "The end must come after the start", path: ["end"] });

/**
 * The test's record when a reviewer's span (an exercise phase, a span set aside) can be saved on it: the test has data,
 * the page is not stale, and the span lies inside the record; otherwise the form's errors, with what was typed kept.
 */
function spanOnRecord(
  testId: number,
  startS: number,
  endS: number,
  what: "phase" | "span",
  values: Record<string, string>,
): { record: TestRecord } | { errors: Record<string, string>; values: Record<string, string> } {
  const record = getTest(testId)?.record;
  if (!record || record.table.rows.length < 2) return { errors: { form: "This test has no usable data." }, values };
  const stale = settingsChangedSince(testId, values.versionToken);
  if (stale) return { errors: { form: stale }, values };
  const first = record.table.rows[0].timeS;
  const last = record.table.rows[record.table.rows.length - 1].timeS;
  if (startS < first || endS > last)
    return {
      errors: { start: `The ${what} must lie inside the record (${formatClock(first)} to ${formatClock(last)}).` },
      values,
    };
  return { record };
}

/** A reviewer's incremental exercise phase: a new settings version; thresholds and every index are recomputed. */
export async function saveExerciseSpan(_prev: FormState, form: FormData): Promise<FormState> {
  const values = formValues(form);
  const access = await currentAccess();
  if (!access) return { errors: { form: SESSION_NEEDED }, values };
  signedInAs(access, values);
  const parsed = exerciseSpanSchema.safeParse(values);
  if (!parsed.success) return { errors: errorsOf(parsed.error), values };
  const o = parsed.data;
  const checked = spanOnRecord(o.testId, o.start, o.end, "phase", values);
  if ("errors" in checked) return checked;
  const current = effectiveSettings(o.testId, getLabDefaults());
  const settings: AnalysisSettings = {
    ...current,
    conditioning: {
      ...current.conditioning,
      phases: {
        ...current.conditioning?.phases,
        exerciseSpan: { startS: o.start, endS: o.end, reason: `${o.reason}, by ${o.by}` },
      },
    },
  };
  saveAnalysisVersion(
    o.testId,
    settings,
    ENGINE_VERSION,
    actorFor(access, o.by),
    `exercise phase set to ${formatClock(o.start)}–${formatClock(o.end)}: ${o.reason}`,
  );
  revalidatePath(`/tests/${o.testId}`);
  return { ok: "Exercise phase saved as a new analysis version; thresholds and all indices were recomputed." };
}

/** At most this many spans set aside per test (our choice: more would be a different recording). */
const MAX_SET_ASIDE_SPANS = 20;

const setAsideSchema = z
  .object({
    testId: recordId("test"),
    start: clockOrSeconds("Start"),
    end: clockOrSeconds("End"),
    channel: z.enum(["gas", "heart-rate"], { error: "Choose what to set aside" }),
    reason: z.string().trim().min(5, "Give the reason (at least a few words)").max(300),
    by: z.string().trim().min(2, "Say who is setting the breaths aside").max(80),
  })
  .refine((o) => o.end > o.start, { message: "The end must come after the start", path: ["end"] });

/**
 * Why a span may not be set aside: more than half of the exercise phase (as the current settings find it), or null. A
 * recording that faulty is repeated or re-imported, not analysed without its exercise (our choice).
 */
function setAsideTooLong(table: BreathTable, settings: AnalysisSettings, startS: number, endS: number): string | null {
  const ex = conditionTable(table, settings.conditioning).exercise;
  if (!ex) return null;
  const spans = [...(settings.conditioning?.setAside ?? []).filter((x) => x.channel !== "heart-rate"), { startS, endS }];
  return exerciseShareSetAside(spans, ex) > 0.5
    ? `With this span, more than half of the exercise phase (${formatClock(ex.startS)}–${formatClock(ex.endS)}) would be set aside: a recording that faulty should be repeated or re-imported, not analysed without its exercise.`
    : null;
}

/** A reviewer sets a span of breaths aside (a leak, a run of coughs): a new settings version; everything is recomputed. */
export async function saveSetAside(_prev: FormState, form: FormData): Promise<FormState> {
  const values = formValues(form);
  const access = await currentAccess();
  if (!access) return { errors: { form: SESSION_NEEDED }, values };
  signedInAs(access, values);
  const parsed = setAsideSchema.safeParse(values);
  if (!parsed.success) return { errors: errorsOf(parsed.error), values };
  const o = parsed.data;
  const checked = spanOnRecord(o.testId, o.start, o.end, "span", values);
  if ("errors" in checked) return checked;
  const { record } = checked;
  const current = effectiveSettings(o.testId, getLabDefaults());
  const spans = current.conditioning?.setAside ?? [];
  const covering = spans.find((x) => (x.channel ?? "gas") === o.channel && x.startS <= o.start && x.endS >= o.end);
  if (covering)
    return {
      errors: {
        start: `${formatClock(o.start)}–${formatClock(o.end)} is already set aside (${formatClock(covering.startS)}–${formatClock(covering.endS)}).`,
      },
      values,
    };
  const tooLong = o.channel === "gas" ? setAsideTooLong(record.table, current, o.start, o.end) : null;
  if (tooLong) return { errors: { start: tooLong }, values };
  if (spans.length >= MAX_SET_ASIDE_SPANS)
    return { errors: { form: `At most ${MAX_SET_ASIDE_SPANS} spans can be set aside; restore one first.` }, values };
  const settings: AnalysisSettings = {
    ...current,
    conditioning: {
      ...current.conditioning,
      setAside: [...spans, { startS: o.start, endS: o.end, reason: `${o.reason}, by ${o.by}`, channel: o.channel }],
    },
  };
  saveAnalysisVersion(
    o.testId,
    settings,
    ENGINE_VERSION,
    actorFor(access, o.by),
    `${o.channel === "heart-rate" ? "heart rate" : "breaths"} ${formatClock(o.start)}–${formatClock(o.end)} set aside: ${o.reason}`,
  );
  revalidatePath(`/tests/${o.testId}`);
  return { ok: "Span set aside in a new analysis version; thresholds and all indices were recomputed without it." };
}

const restoreSchema = z.object({
  testId: recordId("test"),
  span: z.coerce.number().int().min(0).max(MAX_SET_ASIDE_SPANS),
  reason: z.string().trim().min(3).max(200),
  by: z.string().trim().min(2).max(80),
});

/** Put a set-aside span back (by its place in the list), with why and who did it: a new settings version. */
export async function restoreSetAside(form: FormData): Promise<void> {
  const access = await actionAccess(testPath(form));
  const values = formValues(form);
  signedInAs(access, values);
  const parsed = restoreSchema.safeParse(values);
  // a page opened before another change may list the spans in another order: nothing is restored from it
  if (!parsed.success || settingsChangedSince(parsed.data.testId, values.versionToken)) return;
  const { testId, span: at, reason, by } = parsed.data;
  const current = latestSettings(testId)?.settings;
  const spans = current?.conditioning?.setAside ?? [];
  if (!current || at >= spans.length) return;
  const gone = spans[at];
  saveAnalysisVersion(
    testId,
    { ...current, conditioning: { ...current.conditioning, setAside: spans.filter((_, i) => i !== at) } },
    ENGINE_VERSION,
    actorFor(access, by),
    `${gone.channel === "heart-rate" ? "heart rate" : "breaths"} ${formatClock(gone.startS)}–${formatClock(gone.endS)} used again: ${reason}, by ${by}`,
  );
  revalidatePath(`/tests/${testId}`);
}

const ticked = (what: string) => z.literal("on", { error: `Tick that ${what} was checked` });

const vo2CheckedSchema = z.object({
  testId: recordId("test"),
  gas: ticked(VO2_CHECKS.gas),
  flow: ticked(VO2_CHECKS.flow),
  mask: ticked(VO2_CHECKS.mask),
  work: ticked(VO2_CHECKS.work),
  reason: z.string().trim().min(5, "Say how it was checked (at least a few words)").max(300),
  by: z.string().trim().min(2, "Say who checked the cart").max(80),
});

/**
 * A reviewer checked the cart and the ergometer and reads VO2-based values although VO2 rose implausibly little with the
 * work rate (`AnalysisSettings.vo2Checked`): a new settings version.
 */
export async function saveVo2Checked(_prev: FormState, form: FormData): Promise<FormState> {
  const values = formValues(form);
  const access = await currentAccess();
  if (!access) return { errors: { form: SESSION_NEEDED }, values };
  signedInAs(access, values);
  const parsed = vo2CheckedSchema.safeParse(values);
  if (!parsed.success) return { errors: errorsOf(parsed.error), values };
  const o = parsed.data;
  if (!getTest(o.testId)) return { errors: { form: "This test does not exist." }, values };
  const stale = settingsChangedSince(o.testId, values.versionToken);
  if (stale) return { errors: { form: stale }, values };
  const current = effectiveSettings(o.testId, getLabDefaults());
  saveAnalysisVersion(
    o.testId,
    {
      ...current,
      vo2Checked: { reason: `checked ${Object.values(VO2_CHECKS).join("; ")}: ${o.reason}, by ${o.by}` },
    },
    ENGINE_VERSION,
    actorFor(access, o.by),
    `VO2-based values read after a check: ${o.reason}`,
  );
  revalidatePath(`/tests/${o.testId}`);
  return { ok: "Saved as a new analysis version: VO2-based values are now read." };
}

const clearVo2Schema = z.object({
  testId: recordId("test"),
  reason: z.string().trim().min(3).max(200),
  by: z.string().trim().min(2).max(80),
});

export async function clearVo2Checked(form: FormData): Promise<void> {
  const access = await actionAccess(testPath(form));
  const values = formValues(form);
  signedInAs(access, values);
  const parsed = clearVo2Schema.safeParse(values);
  if (!parsed.success || settingsChangedSince(parsed.data.testId, values.versionToken)) return;
  const { testId, reason, by } = parsed.data;
  const current = latestSettings(testId)?.settings;
  if (!current?.vo2Checked) return;
  const { vo2Checked: _gone, ...rest } = current;
  saveAnalysisVersion(
    testId,
    rest,
    ENGINE_VERSION,
    actorFor(access, by),
    `VO2-based values no longer read (ΔVO2/ΔWR doubted): ${reason}, by ${by}`,
  );
  revalidatePath(`/tests/${testId}`);
}

export async function clearExerciseSpan(form: FormData): Promise<void> {
  const access = await actionAccess(testPath(form));
  const testId = Number(form.get("testId"));
  const current = latestSettings(testId)?.settings;
  if (!current?.conditioning?.phases?.exerciseSpan) return;
  const { exerciseSpan: _gone, ...phases } = current.conditioning.phases;
  saveAnalysisVersion(
    testId,
    { ...current, conditioning: { ...current.conditioning, phases } },
    ENGINE_VERSION,
    access.actor,
    "exercise phase set by review removed (detected again)",
  );
  revalidatePath(`/tests/${testId}`);
}
