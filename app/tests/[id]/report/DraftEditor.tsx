"use client";

import { useActionState, useEffect } from "react";
import type { SectionRecheck } from "@/lib/report/reportModel";
import { saveDraftAction, type DraftState } from "./actions";
import { SECTION_MAX_CHARS } from "./schemas";

export interface EditableSection {
  id: string;
  title: string;
  text: string;
  /** Set when the text was carried from an earlier analysis and must be re-checked. */
  recheck?: SectionRecheck;
}

/** The re-check note of a carried-forward section: why, what changed, the earlier version, the new generated text. */
function RecheckNote(props: {
  testId: number;
  section: EditableSection;
  recheck: SectionRecheck;
  acked: boolean;
  error?: string;
  onAck: (acked: boolean) => void;
  onUseGenerated: () => void;
}) {
  const { recheck, section } = props;
  return (
    <div className="panel" data-testid={`recheck-${section.id}`} style={{ borderColor: "#a3241b" }}>
      <p className="sev-warning" style={{ margin: 0 }}>
        <strong>Re-check this text.</strong> {recheck.reason}
      </p>
      {recheck.changes.length ? (
        <ul data-testid={`recheck-changes-${section.id}`} style={{ margin: "0.25rem 0" }}>
          {recheck.changes.map((c) => (
            <li key={c}>{c}</li>
          ))}
        </ul>
      ) : null}
      <p className="how" style={{ margin: 0 }}>
        Earlier text:{" "}
        <a href={`/api/tests/${props.testId}/report/pdf?report=${recheck.fromReportId}`}>
          PDF of report version {recheck.fromVersion}
        </a>
      </p>
      {recheck.generated.length ? (
        <details>
          <summary>Text generated from the current values</summary>
          <div data-testid={`recheck-generated-${section.id}`}>
            {recheck.generated.map((p, i) => (
              <p key={i} className="how">
                {p}
              </p>
            ))}
          </div>
          <button type="button" onClick={props.onUseGenerated} data-testid={`use-generated-${section.id}`}>
            Replace my text with the generated text
          </button>
        </details>
      ) : null}
      <label style={{ display: "flex", gap: "0.5rem", alignItems: "flex-start" }}>
        <input
          type="checkbox"
          name={`rechecked:${section.id}`}
          data-testid={`rechecked-${section.id}`}
          checked={props.acked}
          onChange={(e) => props.onAck(e.target.checked)}
        />
        <span>I have re-checked this section against the current values.</span>
      </label>
      {props.error ? <span className="sev-error">{props.error}</span> : null}
    </div>
  );
}

/** Where a save that made a new version leaves its confirmation for the editor of that version. */
export function newVersionKey(testId: number): string {
  return `cpet-desk:new-report-version:test-${testId}`;
}

/**
 * Save, and when the save made a new version (a revision of a signed one), leave its confirmation for the editor of that
 * version: the page re-mounts the editor for it in the same update that brings this answer, so this editor never shows it.
 * Written when the answer arrives, before the new editor mounts.
 */
async function saveAndHandOver(prev: DraftState, form: FormData): Promise<DraftState> {
  const state = await saveDraftAction(prev, form);
  if (state.newVersion && state.savedAt && !state.errors)
    try {
      window.sessionStorage.setItem(
        newVersionKey(Number(form.get("testId"))),
        JSON.stringify({ version: state.newVersion, savedAt: state.savedAt }),
      );
    } catch {
      // storage disabled: the new version's draft mark and version note still say what happened
    }
  return state;
}

/**
 * Editable report text, one textarea per section. The text lives in the parent (`DraftWorkspace`)
 * so the sign form signs exactly what is on screen; it stays as typed whether the save succeeds or
 * is refused by validation. Carried-forward sections show their re-check note.
 */
export function DraftEditor(props: {
  testId: number;
  reportId: number;
  /** The draft revision this tab last saw (refused saves leave it; see `DRAFT_CHANGED_ELSEWHERE`). */
  revision: number;
  signed: boolean;
  sections: EditableSection[];
  texts: Record<string, string>;
  acks: Record<string, boolean>;
  dirty: boolean;
  /** Errors raised for sections by the sign form (e.g. a section not re-checked). */
  signErrors?: Record<string, string>;
  onText: (id: string, text: string) => void;
  onAck: (id: string, acked: boolean) => void;
  onSaved: (texts: Record<string, string>, revision?: number) => void;
}) {
  const [state, action, pending] = useActionState<DraftState, FormData>(saveAndHandOver, {});
  const { onSaved } = props;
  useEffect(() => {
    if (state.savedAt && !state.errors && state.texts) onSaved(state.texts, state.newVersion ? undefined : state.revision);
  }, [state, onSaved]);
  const errors = { ...(props.signErrors ?? {}), ...(state.errors ?? {}) };
  return (
    <form action={action} className="stack" data-testid="draft-form">
      <input type="hidden" name="testId" value={props.testId} />
      <input type="hidden" name="reportId" value={props.reportId} />
      <input type="hidden" name="revision" value={props.revision} />
      <input type="hidden" name="shownStatus" value={props.signed ? "signed" : "draft"} />
      {props.signed ? (
        <p className="how" data-testid="revise-note">
          This version is signed and cannot change. Saving edited text creates a new draft version; the signed version stays as it
          is.
        </p>
      ) : null}
      {props.sections.map((s) => (
        <div key={s.id} className="stack">
          <label>
            <strong>{s.title}</strong>
            <input type="hidden" name={`title:${s.id}`} value={s.title} />
            <textarea
              name={`section:${s.id}`}
              data-testid={`section-${s.id}`}
              rows={5}
              value={props.texts[s.id] ?? ""}
              onChange={(e) => props.onText(s.id, e.target.value)}
              aria-invalid={errors[s.id] ? true : undefined}
            />
            <span className="how">
              Separate paragraphs with a blank line. {(props.texts[s.id] ?? "").length} / {SECTION_MAX_CHARS} characters.
            </span>
          </label>
          {s.recheck ? (
            <RecheckNote
              testId={props.testId}
              section={s}
              recheck={s.recheck}
              acked={Boolean(props.acks[s.id])}
              error={errors[s.id]}
              onAck={(a) => props.onAck(s.id, a)}
              onUseGenerated={() => props.onText(s.id, s.recheck!.generated.join("\n\n"))}
            />
          ) : errors[s.id] ? (
            <span className="sev-error" data-testid={`section-error-${s.id}`}>
              {errors[s.id]}
            </span>
          ) : null}
        </div>
      ))}
      {errors.form && !props.signErrors?.form ? (
        <span className="sev-error" role="alert" data-testid="draft-error">
          {errors.form}
        </span>
      ) : null}
      <div className="row">
        <button type="submit" disabled={pending} data-testid="draft-save">
          {pending ? "Saving…" : props.signed ? "Save as a new draft version" : "Save draft"}
        </button>
        {props.dirty ? (
          <span className="sev-warning" data-testid="draft-unsaved">
            Unsaved changes.
          </span>
        ) : state.savedAt && !state.errors ? (
          <span className="how" data-testid="draft-saved">
            Saved {state.savedAt.slice(11, 19)} UTC{state.newVersion ? ` as draft version ${state.newVersion}` : ""}.
          </span>
        ) : null}
      </div>
    </form>
  );
}
