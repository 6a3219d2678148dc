import "server-only";
import type { ReportSection } from "@/lib/report/reportModel";
import { getDb } from "@/lib/store/db";
import { PDF_PRINTABLE_WORDS, describeChar, unprintableInPdf } from "@/lib/report/pdf/pdfText";
import { getReport, listReports, saveDraft, signReport, type StoredReport } from "@/lib/store/reports";
import { latestSettings } from "@/lib/store/tests";
import { AMENDMENT_REASON_MIN_CHARS, DRAFT_CHANGED_ELSEWHERE } from "./schemas";
import { formatUtcMinute } from "@/lib/units";

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

class Refusal extends Error {
  constructor(readonly errors: Record<string, string>) {
    super("refused");
  }
}

const sameText = (a: readonly ReportSection[], b: readonly ReportSection[]) =>
  JSON.stringify(a.map((s) => [s.id, s.title, s.paragraphs, s.recheck ?? null])) ===
  JSON.stringify(b.map((s) => [s.id, s.title, s.paragraphs, s.recheck ?? null]));

/** When a version was made or signed, in words ("signed by Dr A on 2026-12-04 21:31 UTC", "a draft"). */
function versionWords(r: StoredReport): string {
  return r.status === "signed"
    ? `version ${r.version}, signed by ${r.signedBy} on ${r.signedAt ? formatUtcMinute(r.signedAt) : "an unknown time"}`
    : `version ${r.version}, a draft`;
}

/**
 * Checks every save and signature shares, inside their transaction: the version exists and is this test's, it is the
 * test's newest version (a page left open on an older one would otherwise write text nobody sees again, or sign it),
 * and the sections sent are this version's sections, in order. Returns the sections with the stored titles (a page
 * cannot rename or add a section; the caution section cannot be dropped) and the test's versions, newest first.
 */
function checkVersion(
  testId: number,
  reportId: number,
  sent: readonly OnScreenSection[],
  doing: "saved" | "signed",
): { current: StoredReport; sections: OnScreenSection[]; versions: StoredReport[] } {
  const current = getReport(reportId);
  if (!current)
    throw new Refusal({
      form: "This report version does not exist (it may belong to a database that was reset); reload the page.",
    });
  if (current.testId !== testId)
    throw new Refusal({ form: `Not ${doing}: report version ${reportId} belongs to another test; reload the page.` });
  const versions = listReports(testId);
  const newest = versions[0];
  if (newest && newest.id !== current.id)
    throw new Refusal({
      form:
        `Not ${doing}: a newer version of this report was made after this page was opened (${versionWords(newest)}), so ` +
        `this page shows version ${current.version}, which is no longer the current one. Your text is still on screen: ` +
        "copy what you need, reload the page, and bring your changes into the current version.",
    });
  const storedIds = current.sections.map((s) => s.id);
  const sentIds = sent.map((s) => s.id);
  if (storedIds.join("|") !== sentIds.join("|")) {
    const missing = current.sections.filter((s) => !sentIds.includes(s.id)).map((s) => `“${s.title}”`);
    const unknown = sentIds.filter((id) => !storedIds.includes(id));
    throw new Refusal({
      form:
        `Not ${doing}: the sections sent are not this report's sections` +
        (missing.length ? ` (missing: ${missing.join(", ")})` : "") +
        (unknown.length ? ` (not in this report: ${unknown.join(", ")})` : "") +
        (!missing.length && !unknown.length ? " (in another order)" : "") +
        "; reload the page.",
    });
  }
  const titles = new Map(current.sections.map((s) => [s.id, s.title]));
  return { current, sections: sent.map((s) => ({ ...s, title: titles.get(s.id) ?? s.title })), versions };
}

export interface SaveDraftInput {
  testId: number;
  reportId: number;
  /** The revision of the version the page showed. */
  revision: number;
  /** Whether the page showed that version as a draft or as signed. */
  shownStatus: "draft" | "signed";
  sections: OnScreenSection[];
  rechecked: string[];
  actor: string;
}

export type SaveDraftResult =
  { ok: true; report: StoredReport; newVersion: boolean } | { ok: false; errors: Record<string, string> };

/**
 * Save the text on screen, atomically. A draft is updated in place; a signed version is revised into a new draft.
 * Refused, with nothing written, when the version is not the test's newest, when a draft the page showed has been
 * signed since, when the draft was saved elsewhere since (revision), when the sections are not the version's own, or
 * when a revision of a signed version changes nothing.
 */
export function saveDraftChecked(input: SaveDraftInput): SaveDraftResult {
  const db = getDb();
  try {
    return db.transaction((): SaveDraftResult => {
      const { current, sections: sent } = checkVersion(input.testId, input.reportId, input.sections, "saved");
      if (current.status === "signed" && input.shownStatus === "draft")
        throw new Refusal({
          form:
            `Not saved: this draft was signed after this page was opened (${versionWords(current)}). Your text is still ` +
            "on screen: copy what you need, reload the page to see the signed report, and revise it from there.",
        });
      if (current.status === "draft" && current.revision !== input.revision) throw new Refusal({ form: DRAFT_CHANGED_ELSEWHERE });
      const sections = mergeRecheck(current.sections, sent, input.rechecked);
      if (current.status === "signed" && sameText(current.sections, sections))
        throw new Refusal({
          form: "Nothing saved: the text is the same as the signed version, so no new version was made.",
        });
      const saved = saveDraft(current.id, sections, input.actor);
      if (!saved) throw new Refusal({ form: "This report version does not exist; reload the page." });
      return { ok: true, report: saved, newVersion: saved.id !== current.id };
    })();
  } catch (e) {
    if (e instanceof Refusal) return { ok: false, errors: e.errors };
    throw e;
  }
}

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
  revision: number;
  /**
   * Why this version replaces the earlier signed version (spaces collapsed). Required when an earlier version is signed,
   * ignored otherwise.
   */
  amendmentReason?: string;
  /** The account the signer is signed in with (its display name is `signer`); absent when the app runs without log-in. */
  signerAccount?: string;
}

export type SignDraftResult =
  { ok: true; report: StoredReport; textSaved: boolean } | { ok: false; errors: Record<string, string> };

/**
 * Sign exactly the text on screen, atomically: in one database transaction, the on-screen text is
 * saved into the draft version (when it differs from the stored text) and that version is signed, with the whole
 * report as signed (`freeze`) kept beside it. Any refusal rolls the whole step back, so the stored draft never changes
 * without a signature and no other text than the one the reviewer attested can be signed. Refused (with reasons,
 * nothing changed) when the version is missing, of another test, not the test's newest, already signed, saved
 * elsewhere since the page was opened, written for an analysis that is no longer the test's latest, when its sections
 * are not the version's own, when a carried-forward section was not re-checked, when it replaces an earlier signed
 * version and gives no reason for the amendment, or when the name, text or reason holds characters the PDF cannot show.
 */
export function signDraft(
  input: SignDraftInput,
  freeze?: (signed: StoredReport) => string,
  /** The test's label, printed as the report's title on every page. */
  label?: string,
): SignDraftResult {
  const db = getDb();
  try {
    return db.transaction((): SignDraftResult => {
      const { current, sections: sent, versions } = checkVersion(input.testId, input.reportId, input.sections, "signed");
      if (current.status === "signed")
        throw new Refusal({
          form: `This version was already signed by ${current.signedBy} on ${current.signedAt}. Reload the page to see it.`,
        });
      if (current.revision !== input.revision)
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
      const sections = mergeRecheck(current.sections, sent, input.rechecked);
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
      // an amended report says why it replaces the signed one (recalled practice for amended clinical reports: the
      // amendment is identified as such and explained; the minimum length is our choice)
      const earlierSigned = versions.find((v) => v.id < current.id && v.status === "signed");
      const reason = input.amendmentReason?.replace(/\s+/g, " ").trim() ?? "";
      if (earlierSigned && reason.length < AMENDMENT_REASON_MIN_CHARS)
        throw new Refusal({
          form:
            `Not signed: this version replaces version ${earlierSigned.version}, which is signed. Give the reason for the ` +
            `amendment (at least ${AMENDMENT_REASON_MIN_CHARS} characters); it is printed on the amended report.`,
          amendmentReason: `Why does this version replace signed version ${earlierSigned.version}?`,
        });
      // a name is one line: a line break would print as a second line under "Signed by" on every page
      if (/\p{Cc}/u.test(input.signer))
        throw new Refusal({ form: "Not signed: the name may not hold line breaks, tabs or other control characters." });
      // the signed PDF must show what was signed: characters it would print as "?" are refused, not garbled
      const badName = unprintableInPdf(input.signer);
      const badText = unprintableInPdf(sections.flatMap((s) => [s.title, ...s.paragraphs]).join("\n"));
      const badLabel = unprintableInPdf(label ?? "");
      const badReason = earlierSigned ? unprintableInPdf(reason) : [];
      if (badName.length || badText.length || badLabel.length || badReason.length)
        throw new Refusal({
          form:
            `Not signed: the PDF of the report prints ${PDF_PRINTABLE_WORDS} and cannot show ` +
            [
              badName.length ? `${badName.map(describeChar).join(" ")} in the name` : "",
              badText.length ? `${badText.map(describeChar).join(" ")} in the text` : "",
              badReason.length ? `${badReason.map(describeChar).join(" ")} in the reason for the amendment` : "",
              badLabel.length
                ? `${badLabel.map(describeChar).join(" ")} in the test's label (rename it on the patient page)`
                : "",
            ]
              .filter(Boolean)
              .join(", or ") +
            ". Leave them out or write them in one of those scripts; your text is still on screen.",
        });
      const textSaved = !sameText(current.sections, sections);
      if (textSaved && !saveDraft(current.id, sections, input.signerAccount ?? input.signer))
        throw new Refusal({ form: "This report version does not exist; reload the page." });
      const amendment = earlierSigned ? { revisesVersion: earlierSigned.version, reason } : undefined;
      const signed = signReport(current.id, input.signer, input.attestation, freeze, amendment, input.signerAccount);
      if (!signed.ok) throw new Refusal({ form: signed.reason });
      return { ok: true, report: signed.report, textSaved };
    })();
  } catch (e) {
    if (e instanceof Refusal) return { ok: false, errors: e.errors };
    throw e;
  }
}
