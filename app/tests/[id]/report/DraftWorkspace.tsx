"use client";

import { useCallback, useEffect, useLayoutEffect, useMemo, useRef, useState } from "react";
import { useLeaveGuard } from "../../../components/useLeaveGuard";
import type { SignState } from "./actions";
import { createPortal } from "react-dom";
import { DraftEditor, newVersionKey, type EditableSection } from "./DraftEditor";
import { REPORT_NOTICE_SLOT, toParagraphs } from "./schemas";
import { SignForm, type SignAs } from "./SignForm";

const LEAVE_WARNING = "The report text has changes that are not saved. Leave this page and lose them?";
/** Two texts are the same when saving either would store the same paragraphs (CRLF, blank lines and edge spaces aside). */
const same = (a = "", b = "") => toParagraphs(a).join("\n\n") === toParagraphs(b).join("\n\n");

const RESTORED_NOTICE = "Unsaved text from your last visit was restored — save or discard it.";

/**
 * Where the unsaved text of one draft version is kept in this browser tab (sessionStorage), so it
 * survives any way of leaving the page (Back/Forward, reload, a link): per test and draft version.
 */
export function unsavedTextKey(testId: number, version: number, reportId: number): string {
  return `cpet-desk:unsaved-report-text:test-${testId}:version-${version}:report-${reportId}`;
}

/** Read the kept text; anything unreadable counts as nothing kept. */
function readKept(key: string): Record<string, string> | null {
  try {
    const raw = window.sessionStorage.getItem(key);
    if (!raw) return null;
    const parsed: unknown = JSON.parse(raw);
    if (!parsed || typeof parsed !== "object") return null;
    const texts = (parsed as { texts?: unknown }).texts;
    if (!texts || typeof texts !== "object") return null;
    return Object.fromEntries(Object.entries(texts).filter((e): e is [string, string] => typeof e[1] === "string"));
  } catch {
    return null;
  }
}

const PDF_WARNING = "The report text has changes that are not saved; the PDF holds the last saved text. Download it anyway?";

/** The question before leaving with unsaved text: a different one for a PDF of the saved text. */
const pdfOrLeave = (url: URL) => (url.pathname.startsWith("/api/") ? PDF_WARNING : LEAVE_WARNING);

/**
 * The report text editor and, while the version is a draft, the sign form, sharing one copy of
 * the on-screen text: what the sign form signs is exactly what the editor shows. Warns before the
 * page is left (reload, close, in-app link) while there are unsaved edits, and before a PDF of
 * the saved text is downloaded. Unsaved text is also kept in the tab's sessionStorage (keyed by
 * test and draft version, see `unsavedTextKey`) while it differs from the saved text, so Back and
 * Forward, which cannot ask, lose nothing: on return it is restored with a notice and a button to
 * discard it. It is removed once the text is saved, signed or discarded.
 */
export function DraftWorkspace(props: {
  testId: number;
  /** The signed-in account that would sign (absent without log-in: the signer types a name). */
  signAs?: SignAs;
  reportId: number;
  /** Version number of this report (1-based, per test). */
  version: number;
  /** The draft's saved revision this page shows (`StoredReport.revision`), sent back with each save and signature. */
  revision: number;
  signed: boolean;
  sections: EditableSection[];
  /** The signed version this draft would replace, in words ("version 1, signed by Dr A on …"); the sign form then asks why. */
  amends?: { version: number; words: string };
}) {
  const initial = useMemo(() => Object.fromEntries(props.sections.map((s) => [s.id, s.text])), [props.sections]);
  const [texts, setTexts] = useState<Record<string, string>>(initial);
  const [saved, setSaved] = useState<Record<string, string>>(initial);
  const [acks, setAcks] = useState<Record<string, boolean>>({});
  const [signErrors, setSignErrors] = useState<Record<string, string>>({});
  // The revision this tab last saw: from the server render, or from this tab's own save (whichever is newer).
  const [revision, setRevision] = useState(props.revision);
  if (props.revision > revision) setRevision(props.revision);

  // The server text changed (saved, signed, or a new analysis): that is now the saved text.
  const [savedFrom, setSavedFrom] = useState(initial);
  if (savedFrom !== initial) {
    setSavedFrom(initial);
    setSaved(initial);
  }

  const textDirty = props.sections.some((s) => !same(texts[s.id], saved[s.id]));
  const dirty = textDirty || props.sections.some((s) => s.recheck && acks[s.id]);

  // Keep unsaved text across navigation. Restored after the first render (the server render knows
  // nothing of this tab's storage); written only from then on, so the restore is never overwritten.
  const storageKey = unsavedTextKey(props.testId, props.version, props.reportId);
  const [hydrated, setHydrated] = useState(false);
  const [restored, setRestored] = useState(false);
  // The restore runs once per mount and storage key, against the server text of that moment, before
  // the first paint (a layout effect), so the saved text never flashes in place of the kept one.
  const initialRef = useRef(initial);
  useLayoutEffect(() => {
    const kept = readKept(storageKey);
    if (kept) {
      const first = initialRef.current;
      const changed = Object.entries(kept).filter(([id, t]) => id in first && !same(t, first[id]));
      if (changed.length) {
        // Restoring browser state kept outside React (sessionStorage) once, after hydration.
        setTexts((t) => ({ ...t, ...Object.fromEntries(changed) }));
        setRestored(true);
      }
    }
    setHydrated(true);
  }, [storageKey]);
  useEffect(() => {
    if (!hydrated) return;
    try {
      if (textDirty) {
        const unsaved = Object.fromEntries(
          props.sections.filter((s) => !same(texts[s.id], saved[s.id])).map((s) => [s.id, texts[s.id]]),
        );
        window.sessionStorage.setItem(storageKey, JSON.stringify({ texts: unsaved, keptAt: new Date().toISOString() }));
      } else window.sessionStorage.removeItem(storageKey);
    } catch {
      // Storage full or disabled: the leave warnings still protect the text.
    }
  }, [hydrated, textDirty, texts, saved, storageKey, props.sections]);
  const discardRestored = () => {
    setTexts(saved);
    setRestored(false);
  };
  // Shown at the top of the page (the slot `REPORT_NOTICE_SLOT` that the page provides), where a
  // returning reviewer sees it first; beside the editor when there is no slot.
  const [noticeSlot, setNoticeSlot] = useState<HTMLElement | null>(null);
  useEffect(() => {
    // Looked up after mount: the slot is server-rendered markup outside this component.
    setNoticeSlot(document.getElementById(REPORT_NOTICE_SLOT));
  }, []);
  // the confirmation of the save that made this version (left by the editor of the version it revised)
  const [madeVersion, setMadeVersion] = useState<{ version: number; savedAt: string } | null>(null);
  const madeRef = useRef<HTMLParagraphElement>(null);
  useEffect(() => {
    try {
      const raw = window.sessionStorage.getItem(newVersionKey(props.testId));
      const made = raw ? (JSON.parse(raw) as { version: number; savedAt: string }) : null;
      if (made && made.version === props.version) {
        window.sessionStorage.removeItem(newVersionKey(props.testId));
        // read once after mount from the tab's storage, outside React
        setMadeVersion(made);
      }
    } catch {
      // storage disabled: nothing to confirm
    }
  }, [props.testId, props.version]);
  useEffect(() => {
    if (madeVersion) madeRef.current?.focus();
  }, [madeVersion]);
  const notice =
    restored && textDirty ? (
      <p className="panel sev-warning" data-testid="restored-notice" role="status">
        {RESTORED_NOTICE}{" "}
        <button type="button" className="secondary" onClick={discardRestored} data-testid="discard-restored">
          Discard the restored text
        </button>
      </p>
    ) : null;

  const madeNotice = madeVersion ? (
    <p className="panel sev-info" role="status" tabIndex={-1} ref={madeRef} data-testid="new-version-notice">
      Saved {madeVersion.savedAt.slice(11, 19)} UTC as draft version {madeVersion.version}. The signed version it revises stays as
      it was signed.
    </p>
  ) : null;

  const onSaved = useCallback((t: Record<string, string>, savedRevision?: number) => {
    setSaved(t);
    setAcks({});
    if (savedRevision !== undefined) setRevision((r) => Math.max(r, savedRevision));
  }, []);
  // The text at the time a sign result arrives is the text that was submitted and signed.
  const textsRef = useRef(texts);
  useEffect(() => {
    textsRef.current = texts;
  }, [texts]);
  const onSignResult = useCallback((state: SignState) => {
    setSignErrors(state.errors ?? {});
    if (state.signed) {
      setSaved(textsRef.current);
      setAcks({});
    }
  }, []);

  // once this draft is signed, the keyboard focus goes to the signature line (the sign button it was on is gone)
  const wasSigned = useRef(props.signed);
  useEffect(() => {
    if (props.signed && !wasSigned.current) document.getElementById("signed-by")?.focus();
    wasSigned.current = props.signed;
  }, [props.signed]);

  // the same question for every page-leaving link, a different one for a PDF of the saved text
  useLeaveGuard(dirty, LEAVE_WARNING, pdfOrLeave);

  return (
    <>
      {notice && noticeSlot ? createPortal(notice, noticeSlot) : notice}
      {madeNotice && noticeSlot ? createPortal(madeNotice, noticeSlot) : madeNotice}
      {/* data-ready: the editor has hydrated (and restored kept text), so typing now reaches React's state */}
      <details
        open={!props.signed || (restored && textDirty)}
        data-testid="draft-workspace"
        data-ready={hydrated ? "true" : "false"}
      >
        <summary>{props.signed ? "Revise the text (creates a new draft version)" : "Edit the draft text"}</summary>
        <DraftEditor
          testId={props.testId}
          reportId={props.reportId}
          revision={revision}
          signed={props.signed}
          sections={props.sections}
          texts={texts}
          acks={acks}
          dirty={dirty}
          signErrors={props.signed ? undefined : signErrors}
          onText={(id, text) => setTexts((t) => ({ ...t, [id]: text }))}
          onAck={(id, a) => setAcks((x) => ({ ...x, [id]: a }))}
          onSaved={onSaved}
        />
      </details>
      {props.signed ? null : (
        <>
          <h2>Signature</h2>
          <section className="panel">
            <p data-testid="signature">Not signed.</p>
            <SignForm
              testId={props.testId}
              reportId={props.reportId}
              revision={revision}
              sections={props.sections.map((s) => ({ id: s.id, title: s.title }))}
              texts={texts}
              acks={acks}
              dirty={dirty}
              amends={props.amends}
              signAs={props.signAs}
              onResult={onSignResult}
            />
          </section>
        </>
      )}
    </>
  );
}
