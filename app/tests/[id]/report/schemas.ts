import { z } from "zod";
import type { SignDraftInput } from "./signDraft";
import { recordId } from "../../../schemas";

/** Id of the element near the top of the report page where the restored-text notice is shown. */
export const REPORT_NOTICE_SLOT = "report-text-notice";

/** Longest text accepted in one section (characters): a generous page of prose. */
export const SECTION_MAX_CHARS = 4000;

/** One edited section as sent by the draft form: its id and its text (paragraphs separated by blank lines). */
export const draftFormSchema = z.object({
  testId: recordId("test"),
  reportId: recordId("report version"),
  /** The revision of the version the page showed (`StoredReport.revision`): a save or signature without it is refused. */
  revision: z
    .string({ message: "The page sent no draft revision; reload the page" })
    .regex(/^\d+$/, "The page sent no draft revision; reload the page")
    .transform(Number),
  /** Whether the page showed that version as a draft or as signed (a draft signed since is then not silently revised). */
  shownStatus: z.enum(["draft", "signed"], { message: "The page did not say which version it showed; reload the page" }),
  sections: z
    .array(
      z.object({
        id: z.string().regex(/^[a-z0-9-]+$/),
        title: z.string().trim().min(1).max(120),
        text: z.string().max(SECTION_MAX_CHARS, `A section may hold at most ${SECTION_MAX_CHARS} characters`),
      }),
    )
    .min(1)
    .max(20),
});

/** Why a save from a page opened before another save is refused (nothing is overwritten). */
export const DRAFT_CHANGED_ELSEWHERE =
  "Not saved: this draft was saved elsewhere (another tab or another person) after this page was opened, and saving " +
  "now would overwrite that text. Your text is still on screen: copy what you need, reload the page to see the saved " +
  "draft, and bring your changes into it.";

/** Longest reason for an amendment (characters; our choice): a few sentences, printed on the report's first page. */
export const AMENDMENT_REASON_MAX_CHARS = 500;

/** Shortest reason for an amendment (characters, after collapsing spaces): "typo." passes, a blank or "x" does not. */
export const AMENDMENT_REASON_MIN_CHARS = 5;

export const ATTESTATION =
  "I have reviewed the data, the values, the charts and the text of this report, and I take clinical responsibility for it as signed.";

/** The sign form: signer, attestation, and the report text exactly as it is on screen. */
export const signFormSchema = z.object({
  testId: recordId("test"),
  reportId: recordId("report version"),
  revision: draftFormSchema.shape.revision,
  sections: draftFormSchema.shape.sections,
  signer: z
    .string()
    .trim()
    .min(3, "Enter your full name (at least 3 characters)")
    .max(120, "The name may hold at most 120 characters"),
  attest: z.literal("on", { message: "Confirm that you have reviewed the report" }),
  /** Why this version replaces an earlier signed one (asked only then; `signDraft` decides whether it is needed). */
  amendmentReason: z
    .string()
    .transform((s) => s.replace(/\s+/g, " ").trim())
    .pipe(z.string().max(AMENDMENT_REASON_MAX_CHARS, `The reason may hold at most ${AMENDMENT_REASON_MAX_CHARS} characters`))
    .optional(),
});

/** Paragraphs from a textarea: split at blank lines, trimmed, empty ones dropped. */
export function toParagraphs(text: string): string[] {
  return text
    .replace(/\r\n/g, "\n")
    .split(/\n\s*\n/)
    .map((p) => p.trim())
    .filter((p) => p.length > 0);
}

/** Validated sections as report sections: their text split into paragraphs. */
export function toOnScreen(sections: readonly SubmittedSection[]): { id: string; title: string; paragraphs: string[] }[] {
  return sections.map((x) => ({ id: x.id, title: x.title, paragraphs: toParagraphs(x.text) }));
}

/** One section as sent by the draft or sign form, before validation. */
export interface SubmittedSection {
  id: string;
  title: string;
  text: string;
}

/**
 * Read the report text fields of a form: `section:<id>` (text), `title:<id>` and `rechecked:<id>`
 * (the reviewer confirmed a carried-forward section against the current values). Sections keep
 * the order of the form.
 */
export function readSectionsForm(form: FormData): { sections: SubmittedSection[]; rechecked: string[] } {
  const sections: SubmittedSection[] = [];
  const rechecked: string[] = [];
  for (const [key, value] of form.entries()) {
    if (typeof value !== "string") continue;
    if (key.startsWith("section:")) {
      const id = key.slice("section:".length);
      sections.push({ id, title: String(form.get(`title:${id}`) ?? ""), text: value });
    } else if (key.startsWith("rechecked:") && value === "on") rechecked.push(key.slice("rechecked:".length));
  }
  return { sections, rechecked };
}

/** Validation messages of the section list, keyed by section id ("form" for the list as a whole). */
export function sectionErrors(
  issues: readonly { path: readonly PropertyKey[]; message: string }[],
  sections: SubmittedSection[],
) {
  const errors: Record<string, string> = {};
  for (const issue of issues) {
    const key = issue.path[0] === "sections" && typeof issue.path[1] === "number" ? sections[issue.path[1]]?.id : "form";
    if (key && !errors[key]) errors[key] = issue.message;
  }
  return errors;
}

/**
 * The sign form read and validated, as the sign action uses it: the submitted sections (for messages) and
 * either the input `signDraft` takes or the validation error.
 */
export function readSignForm(
  form: FormData,
): { sections: SubmittedSection[] } & ({ input: SignDraftInput; error: null } | { input: null; error: z.ZodError }) {
  const { sections, rechecked } = readSectionsForm(form);
  const parsed = signFormSchema.safeParse({
    testId: form.get("testId"),
    reportId: form.get("reportId"),
    revision: form.get("revision") ?? undefined,
    sections,
    signer: form.get("signer"),
    attest: form.get("attest") ?? undefined,
    amendmentReason: form.get("amendmentReason") ?? undefined,
  });
  if (!parsed.success) return { sections, input: null, error: parsed.error };
  const d = parsed.data;
  return {
    sections,
    error: null,
    input: {
      testId: d.testId,
      reportId: d.reportId,
      revision: d.revision,
      signer: d.signer,
      attestation: ATTESTATION,
      sections: toOnScreen(d.sections),
      rechecked,
      ...(d.amendmentReason ? { amendmentReason: d.amendmentReason } : {}),
    },
  };
}
