"use client";

import { useActionState } from "react";
import { FormMessages } from "../../../components/CutoffChoiceFields";
import { clearExerciseSpan, saveExerciseSpan, type FormState } from "../actions";

/** Set the incremental exercise phase by hand (start, end, reason), or go back to the detected one. */
export function ExerciseSpanForm({
  testId,
  current,
  byReview,
}: {
  testId: number;
  current: { start: string; end: string } | null;
  byReview: boolean;
}) {
  const [state, action, pending] = useActionState<FormState, FormData>(saveExerciseSpan, {});
  const v = state.values ?? {};
  const e = state.errors ?? {};
  return (
    <details className="how" data-testid="exercise-span">
      <summary>set the exercise phase by hand{byReview ? " (now set by review)" : ""}</summary>
      <form action={action} className="stack" style={{ marginTop: "0.5rem" }}>
        <input type="hidden" name="testId" value={testId} />
        <div className="row">
          <label>
            Start of the incremental phase (m:ss)
            <input name="start" defaultValue={v.start ?? current?.start ?? ""} size={6} placeholder="6:00" />
          </label>
          <label>
            End (m:ss)
            <input name="end" defaultValue={v.end ?? current?.end ?? ""} size={6} placeholder="16:30" />
          </label>
          <label>
            Reviewer
            <input name="by" defaultValue={v.by ?? ""} size={14} />
          </label>
        </div>
        <label>
          Reason
          <input name="reason" defaultValue={v.reason ?? ""} placeholder="e.g. ramp start from the test log" />
        </label>
        <FormMessages errors={e} ok={state.ok} />
        <div>
          <button type="submit" disabled={pending}>
            Save exercise phase
          </button>
        </div>
      </form>
      {byReview && (
        <form action={clearExerciseSpan} style={{ marginTop: "0.5rem" }}>
          <input type="hidden" name="testId" value={testId} />
          <button type="submit">Use the detected phase again</button>
        </form>
      )}
    </details>
  );
}
