"use client";

import { useActionState } from "react";
import { restoreSetAside, saveSetAside, type FormState } from "../actions";
import { ReasonAndSubmit, ReviewerField, ReviewerNameInput, ShortReasonInput } from "./ReviewerFields";

/** Set a span of breaths aside by hand (start, end, reason), and put set-aside spans back. */
export function SetAsideForm({
  signedInName,
  testId,
  spans,
  versionToken,
}: {
  /** Signed in: the reviewer is the account and the name is not typed. */
  signedInName?: string;
  testId: number;
  /** The spans set aside now, as shown ("17:16–17:28: mask leak, by J. Smith"). */
  spans: { label: string }[];
  /** The analysis version the page shows (`settingsToken`): a change from a stale page is refused. */
  versionToken: string;
}) {
  const [state, action, pending] = useActionState<FormState, FormData>(saveSetAside, {});
  const v = state.values ?? {};
  const e = state.errors ?? {};
  return (
    <details className="how" data-testid="set-aside" open={spans.length > 0 || undefined}>
      <summary>
        set breaths aside by hand{spans.length > 0 ? ` (${spans.length} span${spans.length > 1 ? "s" : ""} set aside)` : ""}
      </summary>
      <p>
        For a fault the automatic screens cannot see, such as a mask leak, a run of coughs or a pause: the gas and ventilation
        values in the span are not used (heart rate, SpO2 and the load are kept), and the analysis is recomputed as a new version.
        A span over more than half of the exercise phase is refused.
      </p>
      {spans.length > 0 && (
        <ul>
          {spans.map((s, i) => (
            <li key={`${i}-${s.label}`}>
              {s.label}{" "}
              <form action={restoreSetAside} style={{ display: "inline" }}>
                <input type="hidden" name="versionToken" value={versionToken} />
                <input type="hidden" name="testId" value={testId} />
                <input type="hidden" name="span" value={i} />
                <ShortReasonInput /> <ReviewerNameInput signedInName={signedInName} />{" "}
                <button type="submit">Use these breaths again</button>
              </form>
            </li>
          ))}
        </ul>
      )}
      <form action={action} className="stack" style={{ marginTop: "0.5rem" }}>
        <input type="hidden" name="versionToken" value={versionToken} />
        <input type="hidden" name="testId" value={testId} />
        <div className="row">
          <label>
            From (m:ss)
            <input name="start" defaultValue={v.start ?? ""} size={6} placeholder="11:40" />
          </label>
          <label>
            To (m:ss)
            <input name="end" defaultValue={v.end ?? ""} size={6} placeholder="13:20" />
          </label>
          <label>
            What
            <select name="channel" defaultValue={v.channel ?? "gas"}>
              <option value="gas">gas and ventilation values (a leak, coughs)</option>
              <option value="heart-rate">heart rate (an ECG artefact)</option>
            </select>
          </label>
          <ReviewerField value={v.by} signedInName={signedInName} />
        </div>
        <ReasonAndSubmit
          value={v.reason}
          placeholder="e.g. mask leak noted on the test log"
          errors={e}
          ok={state.ok}
          pending={pending}
          submitLabel="Set these breaths aside"
        />
      </form>
    </details>
  );
}
