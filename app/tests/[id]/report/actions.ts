"use server";

import { revalidatePath } from "next/cache";
import { saveDraft, signReport } from "@/lib/store/reports";
import { ATTESTATION, draftFormSchema, signFormSchema, toParagraphs } from "./schemas";

export interface DraftState {
  /** The text as the user sent it, so nothing typed is lost when validation fails. */
  texts?: Record<string, string>;
  errors?: Record<string, string>;
  savedAt?: string;
  /** Set when saving created a new draft version (the report was signed). */
  newVersion?: number;
}

/** Read `section:<id>` / `title:<id>` fields into the form's section list. */
function readSections(form: FormData) {
  const sections: { id: string; title: string; text: string }[] = [];
  for (const [key, value] of form.entries()) {
    if (!key.startsWith("section:") || typeof value !== "string") continue;
    const id = key.slice("section:".length);
    sections.push({ id, title: String(form.get(`title:${id}`) ?? ""), text: value });
  }
  return sections;
}

export async function saveDraftAction(_prev: DraftState, form: FormData): Promise<DraftState> {
  const sections = readSections(form);
  const texts = Object.fromEntries(sections.map((s) => [s.id, s.text]));
  const parsed = draftFormSchema.safeParse({ testId: form.get("testId"), reportId: form.get("reportId"), sections });
  if (!parsed.success) {
    const errors: Record<string, string> = {};
    for (const issue of parsed.error.issues) {
      const key = issue.path[0] === "sections" && typeof issue.path[1] === "number" ? sections[issue.path[1]]?.id : "form";
      if (key && !errors[key]) errors[key] = issue.message;
    }
    return { texts, errors };
  }
  const { testId, reportId } = parsed.data;
  const saved = saveDraft(
    reportId,
    parsed.data.sections.map((s) => ({ id: s.id, title: s.title, paragraphs: toParagraphs(s.text) })),
    "local user",
  );
  if (!saved || saved.testId !== testId) return { texts, errors: { form: "This report no longer exists; reload the page." } };
  revalidatePath(`/tests/${testId}/report`);
  return { texts, savedAt: new Date().toISOString(), newVersion: saved.id !== reportId ? saved.version : undefined };
}

export interface SignState {
  values?: { signer?: string };
  errors?: Record<string, string>;
  signed?: boolean;
}

export async function signReportAction(_prev: SignState, form: FormData): Promise<SignState> {
  const values = { signer: String(form.get("signer") ?? "") };
  const parsed = signFormSchema.safeParse({
    testId: form.get("testId"),
    reportId: form.get("reportId"),
    signer: form.get("signer"),
    attest: form.get("attest") ?? undefined,
  });
  if (!parsed.success) {
    const errors: Record<string, string> = {};
    for (const issue of parsed.error.issues) {
      const key = String(issue.path[0] ?? "form");
      if (!errors[key]) errors[key] = issue.message;
    }
    return { values, errors };
  }
  const res = signReport(parsed.data.reportId, parsed.data.signer, ATTESTATION);
  if (!res.ok) return { values, errors: { form: res.reason } };
  revalidatePath(`/tests/${parsed.data.testId}/report`);
  return { signed: true };
}
