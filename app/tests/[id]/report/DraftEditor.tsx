"use client";

import { useActionState, useState } from "react";
import { saveDraftAction, type DraftState } from "./actions";
import { SECTION_MAX_CHARS } from "./schemas";

export interface EditableSection {
  id: string;
  title: string;
  text: string;
}

/**
 * Editable report text, one textarea per section. Textareas are controlled, so the user's text
 * stays exactly as typed whether the save succeeds or is refused by validation.
 */
export function DraftEditor(props: { testId: number; reportId: number; signed: boolean; sections: EditableSection[] }) {
  const [state, action, pending] = useActionState<DraftState, FormData>(saveDraftAction, {});
  const [texts, setTexts] = useState<Record<string, string>>(() => Object.fromEntries(props.sections.map((s) => [s.id, s.text])));
  const errors = state.errors ?? {};
  return (
    <form action={action} className="stack" data-testid="draft-form">
      <input type="hidden" name="testId" value={props.testId} />
      <input type="hidden" name="reportId" value={props.reportId} />
      {props.signed ? (
        <p className="how" data-testid="revise-note">
          This version is signed and cannot change. Saving edited text creates a new draft version; the signed version stays as it
          is.
        </p>
      ) : null}
      {props.sections.map((s) => (
        <label key={s.id}>
          <strong>{s.title}</strong>
          <input type="hidden" name={`title:${s.id}`} value={s.title} />
          <textarea
            name={`section:${s.id}`}
            data-testid={`section-${s.id}`}
            rows={5}
            value={texts[s.id] ?? ""}
            onChange={(e) => setTexts((t) => ({ ...t, [s.id]: e.target.value }))}
            aria-invalid={errors[s.id] ? true : undefined}
          />
          <span className="how">
            Separate paragraphs with a blank line. {(texts[s.id] ?? "").length} / {SECTION_MAX_CHARS} characters.
          </span>
          {errors[s.id] ? (
            <span className="sev-error" data-testid={`section-error-${s.id}`}>
              {errors[s.id]}
            </span>
          ) : null}
        </label>
      ))}
      {errors.form ? <span className="sev-error">{errors.form}</span> : null}
      <div className="row">
        <button type="submit" disabled={pending} data-testid="draft-save">
          {pending ? "Saving…" : props.signed ? "Save as a new draft version" : "Save draft"}
        </button>
        {state.savedAt && !state.errors ? (
          <span className="how" data-testid="draft-saved">
            Saved {state.savedAt.slice(11, 19)} UTC{state.newVersion ? ` as draft version ${state.newVersion}` : ""}.
          </span>
        ) : null}
      </div>
    </form>
  );
}
