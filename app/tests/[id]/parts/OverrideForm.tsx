"use client";

import { useActionState } from "react";
import { clearOverride, overrideThreshold, type FormState } from "../actions";
import { ReasonAndSubmit, ReviewerField, ReviewerNameInput, ShortReasonInput } from "./ReviewerFields";

/** The threshold a reviewer form acts on, the analysis version the page shows, and the signed-in reviewer. */
interface OverrideFormProps {
  testId: number;
  which: "vt1" | "vt2";
  versionToken: string;
  /** Signed in: the reviewer is the account and the name is not typed. */
  signedInName?: string;
}

export function OverrideForm({ testId, which, versionToken, signedInName }: OverrideFormProps) {
  const [state, action, pending] = useActionState<FormState, FormData>(overrideThreshold, {});
  const v = state.values ?? {};
  const e = state.errors ?? {};
  return (
    <details className="how" data-testid={`override-${which}`}>
      <summary>set {which.toUpperCase()} by hand (reviewer override)</summary>
      <form action={action} className="stack" style={{ marginTop: "0.5rem" }}>
        <input type="hidden" name="testId" value={testId} />
        <input type="hidden" name="versionToken" value={versionToken} />
        <input type="hidden" name="which" value={which} />
        <div className="row">
          <label>
            VO2 at {which.toUpperCase()} (mL/min)
            <input name="vo2MlMin" type="number" step="any" defaultValue={v.vo2MlMin ?? ""} size={7} />
          </label>
          <label>
            or time (m:ss)
            <input name="time" defaultValue={v.time ?? ""} size={6} placeholder="8:30" />
          </label>
          <ReviewerField value={v.by} signedInName={signedInName} />
        </div>
        <ReasonAndSubmit
          value={v.reason}
          placeholder="e.g. clear VE/VO2 rise at 8:30 with flat VE/VCO2"
          errors={e}
          ok={state.ok}
          pending={pending}
          submitLabel="Save override"
        />
      </form>
    </details>
  );
}

/**
 * Remove a reviewer's override and use the automatic estimate again: like setting one, it says why and who (the server
 * refuses it otherwise, and the version list names both).
 */
export function RemoveOverrideForm({ testId, which, versionToken, signedInName }: OverrideFormProps) {
  return (
    <form action={clearOverride} data-testid={`remove-override-${which}`}>
      <input type="hidden" name="testId" value={testId} />
      <input type="hidden" name="which" value={which} />
      <input type="hidden" name="versionToken" value={versionToken} />
      <ShortReasonInput label="Reason for removing the override" /> <ReviewerNameInput signedInName={signedInName} />{" "}
      <button type="submit" className="secondary">
        Remove override
      </button>
    </form>
  );
}
