"use client";

import { useActionState } from "react";
import styles from "../columns/columns.module.css";
import { saveLabel, type LabelFormState } from "./actions";

/** The test's label: its name in the register and its report's title (anonymised teaching cases get a neutral one). */
export function LabelForm({ testId, label }: { testId: number; label: string }) {
  const [state, action, pending] = useActionState<LabelFormState, FormData>(saveLabel, {});
  return (
    <form action={action} className="stack" data-testid="label-form">
      <input type="hidden" name="testId" value={testId} />
      <label className={styles.label}>
        Label in the register and on the report
        <input name="label" defaultValue={state.value ?? label} maxLength={120} data-testid="label-input" />
      </label>
      {state.error ? (
        <p className="sev-error" role="alert" data-testid="label-error">
          {state.error}
        </p>
      ) : null}
      {state.ok ? (
        <p className="sev-info" role="status" data-testid="label-ok">
          {state.ok}
        </p>
      ) : null}
      <div>
        <button type="submit" disabled={pending} className="secondary" data-testid="label-save">
          {pending ? "Saving…" : "Save the label"}
        </button>
      </div>
    </form>
  );
}
