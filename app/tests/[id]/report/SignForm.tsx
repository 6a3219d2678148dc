"use client";

import { useActionState, useState } from "react";
import { signReportAction, type SignState } from "./actions";
import { ATTESTATION } from "./schemas";

/** Sign the current draft: the signer's name and an explicit review attestation. */
export function SignForm(props: { testId: number; reportId: number }) {
  const [state, action, pending] = useActionState<SignState, FormData>(signReportAction, {});
  const [signer, setSigner] = useState(state.values?.signer ?? "");
  const errors = state.errors ?? {};
  return (
    <form action={action} className="stack" data-testid="sign-form">
      <input type="hidden" name="testId" value={props.testId} />
      <input type="hidden" name="reportId" value={props.reportId} />
      <label>
        Signed by (full name)
        <input
          name="signer"
          data-testid="signer"
          value={signer}
          onChange={(e) => setSigner(e.target.value)}
          autoComplete="name"
        />
        {errors.signer ? <span className="sev-error">{errors.signer}</span> : null}
      </label>
      <label style={{ display: "flex", gap: "0.5rem", alignItems: "flex-start" }}>
        <input type="checkbox" name="attest" data-testid="attest" />
        <span>{ATTESTATION}</span>
      </label>
      {errors.attest ? <span className="sev-error">{errors.attest}</span> : null}
      {errors.form ? <span className="sev-error">{errors.form}</span> : null}
      <div>
        <button type="submit" disabled={pending} data-testid="sign-submit">
          {pending ? "Signing…" : "Sign the report"}
        </button>
      </div>
    </form>
  );
}
