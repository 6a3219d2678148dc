"use server";

import { revalidatePath } from "next/cache";
import { freezeReport } from "./loadReport";
import { draftFormSchema, readSectionsForm, readSignForm, sectionErrors, toOnScreen } from "./schemas";
import { saveDraftChecked, signDraft } from "./signDraft";
import { SESSION_NEEDED, currentAccess } from "../../../access";
import { confirmPassword } from "@/lib/store/accounts";

export interface DraftState {
  /** The text as the user sent it, so nothing typed is lost when validation fails. */
  texts?: Record<string, string>;
  /** Carried-forward sections confirmed as re-checked with this save. */
  rechecked?: string[];
  errors?: Record<string, string>;
  savedAt?: string;
  /** Set when saving created a new draft version (the report was signed). */
  newVersion?: number;
  /** The draft's revision after this save (the page sends it with its next save or signature). */
  revision?: number;
}

export async function saveDraftAction(_prev: DraftState, form: FormData): Promise<DraftState> {
  const { sections, rechecked } = readSectionsForm(form);
  const texts = Object.fromEntries(sections.map((s) => [s.id, s.text]));
  // the text stays on screen when the session has ended
  const access = await currentAccess();
  if (!access) return { texts, errors: { form: SESSION_NEEDED } };
  const parsed = draftFormSchema.safeParse({
    testId: form.get("testId"),
    reportId: form.get("reportId"),
    revision: form.get("revision") ?? undefined,
    shownStatus: form.get("shownStatus") ?? undefined,
    sections,
  });
  if (!parsed.success) return { texts, errors: sectionErrors(parsed.error.issues, sections) };
  const { testId, reportId } = parsed.data;
  // checked and saved in one transaction: no other request runs between them
  const res = saveDraftChecked({
    testId,
    reportId,
    revision: parsed.data.revision,
    shownStatus: parsed.data.shownStatus,
    sections: toOnScreen(parsed.data.sections),
    rechecked,
    actor: access.actor,
  });
  if (!res.ok) return { texts, errors: res.errors };
  revalidatePath(`/tests/${testId}/report`);
  return {
    texts,
    rechecked,
    savedAt: new Date().toISOString(),
    newVersion: res.newVersion ? res.report.version : undefined,
    revision: res.report.revision,
  };
}

const readSignValues = (form: FormData) => ({
  signer: String(form.get("signer") ?? ""),
  amendmentReason: String(form.get("amendmentReason") ?? ""),
});

export interface SignState {
  values?: { signer?: string; amendmentReason?: string };
  errors?: Record<string, string>;
  signed?: boolean;
  /** The on-screen text differed from the stored draft and was saved as part of signing. */
  textSaved?: boolean;
}

/**
 * Sign the report with the text exactly as it is on the reviewer's screen (the sign form carries
 * it): saved and signed in one transaction by `signDraft`.
 */
export async function signReportAction(_prev: SignState, form: FormData): Promise<SignState> {
  const access = await currentAccess();
  if (!access) return { values: readSignValues(form), errors: { form: `Not signed. ${SESSION_NEEDED}` } };
  // signed in, the signature is the account's display name, whatever the form sends; only a clinician account signs
  if (access.mode === "account" && access.account.role !== "clinician")
    return {
      values: readSignValues(form),
      errors: {
        form: `Not signed: the account "${access.account.username}" is a ${access.account.role} account, and only a clinician account can sign. Save the draft for a clinician to sign.`,
      },
    };
  // signed in, a signature asks for the password again: a session left open on a ward computer does not sign
  if (access.mode === "account" && !(await confirmPassword(access.account.username, String(form.get("password") ?? ""))))
    return {
      values: readSignValues(form),
      errors: {
        form: "Not signed: the password is not right (or log-in for this account is locked after repeated failures). Your text is still on screen.",
        password: "Give your password to sign.",
      },
    };
  if (access.mode === "account") form.set("signer", access.account.displayName);
  const values = readSignValues(form);
  const { sections, input, error } = readSignForm(form);
  if (!input) {
    const errors: Record<string, string> = {};
    const textIssues = error.issues.filter((i) => i.path[0] === "sections");
    for (const issue of error.issues) if (issue.path[0] !== "sections") errors[String(issue.path[0] ?? "form")] ??= issue.message;
    const first = Object.entries(sectionErrors(textIssues, sections))[0];
    if (first) {
      const title = sections.find((s) => s.id === first[0])?.title;
      errors.text = `Not signed: the report text is not valid${title ? ` in “${title}”` : ""}: ${first[1]}.`;
    }
    return { values, errors };
  }
  // the report as it will read once signed is kept with the signature, so it never changes afterwards
  const kept = freezeReport(input.testId, input.reportId);
  const res = signDraft(
    access.mode === "account" ? { ...input, signerAccount: access.account.username } : input,
    kept?.freeze,
    kept?.label,
  );
  if (!res.ok) return { values, errors: res.errors };
  revalidatePath(`/tests/${input.testId}/report`);
  return { signed: true, textSaved: res.textSaved };
}
