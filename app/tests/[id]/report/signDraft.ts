import "server-only";
import type { ReportSection } from "@/lib/report/reportModel";
import { getDb } from "@/lib/store/db";
import { getReport, saveDraft, signReport, type StoredReport } from "@/lib/store/reports";
import { latestSettings } from "@/lib/store/tests";

/** A section as the reviewer has it on screen (paragraphs already split). */
export interface OnScreenSection {
  id: string;
  title: string;
  paragraphs: string[];
}

/**
 * Keep the re-check note of each stored section (the server's record, not the browser's) unless
 * the reviewer ticked that the section was re-checked (`rechecked` holds its id).
 */
export function mergeRecheck(
  stored: readonly ReportSection[],
  onScreen: readonly OnScreenSection[],
  rechecked: readonly string[],
): ReportSection[] {
  const notes = new Map(stored.flatMap((s) => (s.recheck ? [[s.id, s.recheck] as const] : [])));
  return onScreen.map((s) => {
    const note = notes.get(s.id);
    const base = { id: s.id, title: s.title, paragraphs: [...s.paragraphs] };
    return note && !rechecked.includes(s.id) ? { ...base, recheck: note } : base;
  });
}

const sameText = (a: readonly ReportSection[], b: readonly ReportSection[]) =>
  JSON.stringify(a.map((s) => [s.id, s.title, s.paragraphs, s.recheck ?? null])) ===
  JSON.stringify(b.map((s) => [s.id, s.title, s.paragraphs, s.recheck ?? null]));

export interface SignDraftInput {
  testId: number;
  reportId: number;
  signer: string;
  attestation: string;
  /** The text on the reviewer's screen when they pressed Sign: this, and nothing else, is signed. */
  sections: OnScreenSection[];
  /** Ids of carried-forward sections the reviewer confirmed as re-checked. */
  rechecked: string[];
  /** The draft revision the page showed; a different stored revision means someone saved since (refused). */
  revision?: number;
}

export type SignDraftResult =
  { ok: true; report: StoredReport; textSaved: boolean } | { ok: false; errors: Record<string, string> };

class Refusal extends Error {
  constructor(readonly errors: Record<string, string>) {
    super("sign refused");
  }
}

/**
 * Sign exactly the text on screen, atomically: in one database transaction, the on-screen text is
 * saved into the draft version (when it differs from the stored text) and that version is signed.
 * Any refusal rolls the whole step back, so the stored draft never changes without a signature and
 * no other text than the one the reviewer attested can be signed. Refused (with reasons, nothing
 * changed) when the version is missing, of another test, already signed, written for an analysis
 * that is no longer the test's latest, or when a carried-forward section was not re-checked.
 */
export function signDraft(input: SignDraftInput): SignDraftResult {
  const db = getDb();
  try {
    return db.transaction((): SignDraftResult => {
      const current = getReport(input.reportId);
      if (!current || current.testId !== input.testId)
        throw new Refusal({ form: "This report no longer exists; reload the page." });
      if (current.status === "signed")
        throw new Refusal({
          form: `This version was already signed by ${current.signedBy} on ${current.signedAt}. Reload the page to see it.`,
        });
      if (input.revision !== undefined && current.revision !== input.revision)
        throw new Refusal({
          form:
            "Not signed: this draft was saved elsewhere (another tab or another person) after this page was opened, so the " +
            "text on your screen is not the saved draft and signing it would overwrite that text. Your text is still on " +
            "screen: copy what you need, reload the page, and sign the current draft.",
        });
      const latest = latestSettings(input.testId);
      if (latest && latest.id !== current.analysisId)
        throw new Refusal({
          form:
            "The analysis of this test changed after this page was opened (for example a threshold was set by hand), so this " +
            "draft no longer matches the current values and cannot be signed. Your text is still on screen: save it with " +
            "“Save draft”, then reload the page to review the report for the current analysis.",
        });
      const sections = mergeRecheck(current.sections, input.sections, input.rechecked);
      const pending = sections.filter((s) => s.recheck);
      if (pending.length) {
        const errors: Record<string, string> = {
          form: `Not signed: ${pending.map((s) => `“${s.title}”`).join(", ")} still ${pending.length === 1 ? "holds" : "hold"} your text from an earlier analysis. Re-read ${pending.length === 1 ? "it" : "each"} against the current values and tick “I have re-checked this section” first.`,
        };
        for (const s of pending) errors[s.id] = "Re-check this section against the current values before signing.";
        throw new Refusal(errors);
      }
      // the report's own caution section may be reworded, not emptied (the page and PDF caution stay regardless)
      const caution = sections.find((s) => s.id === "caution");
      if (caution && caution.paragraphs.every((p) => p.trim() === ""))
        throw new Refusal({
          form: "Not signed: the “Caution” section is empty. A signed report keeps its clinical caution; write or restore it.",
          caution: "The caution may be reworded but not left empty.",
        });
      const textSaved = !sameText(current.sections, sections);
      if (textSaved && !saveDraft(current.id, sections, input.signer))
        throw new Refusal({ form: "This report no longer exists; reload the page." });
      const signed = signReport(current.id, input.signer, input.attestation);
      if (!signed.ok) throw new Refusal({ form: signed.reason });
      return { ok: true, report: signed.report, textSaved };
    })();
  } catch (e) {
    if (e instanceof Refusal) return { ok: false, errors: e.errors };
    throw e;
  }
}
