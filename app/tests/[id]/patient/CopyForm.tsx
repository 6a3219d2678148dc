"use client";

import { useActionState } from "react";
import styles from "../columns/columns.module.css";
import { makeTeachingCopy, type CopyFormState } from "./actions";

/**
 * Make an anonymised copy of the test for teaching: says what is left out and what is kept before anything is made.
 * `removes` and `freeText` are the store's own lists (`ANONYMISED_COPY_REMOVES`, `ANONYMISED_COPY_FREE_TEXT`).
 */
export function CopyForm(props: { testId: number; removes: readonly string[]; freeText: readonly string[] }) {
  const [state, action, pending] = useActionState<CopyFormState, FormData>(makeTeachingCopy, {});
  return (
    <form action={action} className="stack" data-testid="copy-form">
      <input type="hidden" name="testId" value={props.testId} />
      <p className="how" style={{ margin: 0 }}>
        A new test with the same breaths, patient measurements (sex, age, height and body mass, which the predicted values need),
        lactate, blood gases, spirometry and analysis settings, so it reads the same numbers. Left out: {props.removes.join("; ")}
        ; and, unless you tick the box, {props.freeText.join(" and ")}. This test is not changed. Check the label and anything you
        keep for names, dates and record numbers: the copy keeps what you give it.
      </p>
      <label className={styles.label}>
        Label of the copy
        <input
          name="label"
          defaultValue={state.value?.label ?? ""}
          maxLength={120}
          placeholder="e.g. Teaching case 12: exertional breathlessness"
          data-testid="copy-label"
        />
      </label>
      <label style={{ display: "flex", gap: "0.5rem", alignItems: "flex-start" }}>
        <input
          type="checkbox"
          name="keepFreeText"
          defaultChecked={state.value?.keepFreeText ?? false}
          data-testid="copy-keep-text"
        />
        <span>Keep the free text too (I have read it and it names no one)</span>
      </label>
      {state.error ? (
        <p className="sev-error" role="alert" data-testid="copy-error">
          {state.error}
        </p>
      ) : null}
      <div>
        <button type="submit" disabled={pending} className="secondary" data-testid="copy-submit">
          {pending ? "Copying…" : "Make the anonymised copy"}
        </button>
      </div>
    </form>
  );
}
