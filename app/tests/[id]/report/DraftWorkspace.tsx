"use client";

import { useCallback, useEffect, useMemo, useRef, useState } from "react";
import type { SignState } from "./actions";
import { DraftEditor, type EditableSection } from "./DraftEditor";
import { SignForm } from "./SignForm";

const LEAVE_WARNING = "The report text has changes that are not saved. Leave this page and lose them?";
const PDF_WARNING = "The report text has changes that are not saved; the PDF holds the last saved text. Download it anyway?";

/**
 * The report text editor and, while the version is a draft, the sign form, sharing one copy of
 * the on-screen text: what the sign form signs is exactly what the editor shows. Warns before the
 * page is left (reload, close, in-app link) while there are unsaved edits, and before a PDF of
 * the saved text is downloaded.
 */
export function DraftWorkspace(props: { testId: number; reportId: number; signed: boolean; sections: EditableSection[] }) {
  const initial = useMemo(() => Object.fromEntries(props.sections.map((s) => [s.id, s.text])), [props.sections]);
  const [texts, setTexts] = useState<Record<string, string>>(initial);
  const [saved, setSaved] = useState<Record<string, string>>(initial);
  const [acks, setAcks] = useState<Record<string, boolean>>({});
  const [signErrors, setSignErrors] = useState<Record<string, string>>({});

  // Browsers send line breaks as CRLF: compare texts with line breaks normalised.
  const same = (a = "", b = "") => a.replace(/\r\n?/g, "\n") === b.replace(/\r\n?/g, "\n");
  const dirty =
    props.sections.some((s) => !same(texts[s.id], saved[s.id])) || props.sections.some((s) => s.recheck && acks[s.id]);

  const onSaved = useCallback((t: Record<string, string>) => {
    setSaved(t);
    setAcks({});
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

  useEffect(() => {
    if (!dirty) return;
    const beforeUnload = (e: BeforeUnloadEvent) => {
      e.preventDefault();
      e.returnValue = LEAVE_WARNING;
      return LEAVE_WARNING;
    };
    const onClick = (e: MouseEvent) => {
      const a = (e.target as Element | null)?.closest?.("a[href]") as HTMLAnchorElement | null;
      if (!a || a.target === "_blank" || e.defaultPrevented) return;
      const url = new URL(a.href, window.location.href);
      if (url.origin !== window.location.origin) return;
      const pdf = url.pathname.startsWith("/api/");
      if (!window.confirm(pdf ? PDF_WARNING : LEAVE_WARNING)) {
        e.preventDefault();
        e.stopPropagation();
      }
    };
    window.addEventListener("beforeunload", beforeUnload);
    document.addEventListener("click", onClick, true);
    return () => {
      window.removeEventListener("beforeunload", beforeUnload);
      document.removeEventListener("click", onClick, true);
    };
  }, [dirty]);

  return (
    <>
      <details open={!props.signed}>
        <summary>{props.signed ? "Revise the text (creates a new draft version)" : "Edit the draft text"}</summary>
        <DraftEditor
          testId={props.testId}
          reportId={props.reportId}
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
              sections={props.sections.map((s) => ({ id: s.id, title: s.title }))}
              texts={texts}
              acks={acks}
              dirty={dirty}
              onResult={onSignResult}
            />
          </section>
        </>
      )}
    </>
  );
}
