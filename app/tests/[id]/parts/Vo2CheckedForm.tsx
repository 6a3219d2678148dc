"use client";

import { useActionState } from "react";
import { clearVo2Checked, saveVo2Checked, type FormState } from "../actions";
import { ReasonAndSubmit, ReviewerField, ReviewerNameInput, ShortReasonInput } from "./ReviewerFields";
import { VO2_CHECKS } from "../vo2Checks";

/**
 * Shown when VO2 rose implausibly little with the work rate: after checking the cart and the ergometer, a reviewer may
 * read VO2-based values all the same (with what was checked), or stop reading them again.
 */
export function Vo2CheckedForm({
  signedInName,
  testId,
  checkedBy,
  versionToken,
}: {
  /** Signed in: the reviewer is the account and the name is not typed. */
  signedInName?: string;
  testId: number;
  /** The reviewer's word when VO2-based values are read now, else null. */
  checkedBy: string | null;
  /** The analysis version the page shows (`settingsToken`): a change from a stale page is refused. */
  versionToken: string;
}) {
  const [state, action, pending] = useActionState<FormState, FormData>(saveVo2Checked, {});
  const v = state.values ?? {};
  const e = state.errors ?? {};
  if (checkedBy)
    return (
      <div className="how" data-testid="vo2-checked">
        <p>VO2-based values are read at a reviewer&apos;s word: {checkedBy}.</p>
        <form action={clearVo2Checked}>
          <input type="hidden" name="versionToken" value={versionToken} />
          <input type="hidden" name="testId" value={testId} />
          <ShortReasonInput /> <ReviewerNameInput signedInName={signedInName} />{" "}
          <button type="submit">Stop reading VO2-based values</button>
        </form>
      </div>
    );
  return (
    <details className="how" data-testid="vo2-checked">
      <summary>read VO2-based values after checking the cart</summary>
      <p>
        Only when every item below was checked and found right. The values are then read against cut-offs; the report&apos;s
        conclusion and methods say they were read at your word, and ΔVO2/ΔWR itself is still not read.
      </p>
      <form action={action} className="stack" style={{ marginTop: "0.5rem" }}>
        <input type="hidden" name="versionToken" value={versionToken} />
        <input type="hidden" name="testId" value={testId} />
        <fieldset>
          <legend>Checked and found right</legend>
          {Object.entries(VO2_CHECKS).map(([name, label]) => (
            <label key={name} style={{ display: "block" }}>
              <input type="checkbox" name={name} defaultChecked={v[name] === "on"} /> {label}
            </label>
          ))}
        </fieldset>
        <div className="row">
          <ReviewerField value={v.by} signedInName={signedInName} />
        </div>
        <ReasonAndSubmit
          value={v.reason}
          placeholder="e.g. re-calibrated after the test; biological control within 3 %"
          errors={e}
          ok={state.ok}
          pending={pending}
          submitLabel="Read VO2-based values"
        />
      </form>
    </details>
  );
}
