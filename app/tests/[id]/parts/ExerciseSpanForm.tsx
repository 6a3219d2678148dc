"use client";

import { useActionState } from "react";
import { clearExerciseSpan, saveExerciseSpan, type FormState } from "../actions";
import { ReasonAndSubmit, ReviewerField } from "./ReviewerFields";

/** Set the incremental exercise phase by hand (start, end, reason), or go back to the detected one. */
export function ExerciseSpanForm({
  signedInName,
  testId,
  current,
  byReview,
  versionToken,
}: {
  /** Signed in: the reviewer is the account and the name is not typed. */
  signedInName?: string;
  testId: number;
  /** The analysis version the page shows (`settingsToken`): a save from a stale page is refused. */
  versionToken: string;
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
        <input type="hidden" name="versionToken" value={versionToken} />
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
          <ReviewerField value={v.by} signedInName={signedInName} />
        </div>
        <ReasonAndSubmit
          value={v.reason}
          placeholder="e.g. ramp start from the test log"
          errors={e}
          ok={state.ok}
          pending={pending}
          submitLabel="Save exercise phase"
        />
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
