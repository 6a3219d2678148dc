"use client";

import { startTransition, useActionState, useEffect, useRef, useState, type FormEvent } from "react";
import { SIGNER_NOT_VERIFIED } from "@/lib/report/caution";
import { toPdfText } from "@/lib/report/pdf/pdfText";
import { signReportAction, type SignState } from "./actions";
import { AMENDMENT_REASON_MAX_CHARS, ATTESTATION } from "./schemas";

/** The signed-in account a signature is made with (its display name is the signed name). */
export interface SignAs {
  username: string;
  displayName: string;
  role: "clinician" | "physiologist";
}

/**
 * Sign the current draft: the signer's name, an explicit review attestation, and the report text
 * exactly as it is on screen (hidden fields mirroring the editor), which the server saves and signs
 * in one step. When the on-screen text has unsaved changes the form says so before signing. The
 * name and the attestation box are kept as they were when signing is refused (the form is
 * submitted by hand, so it is not reset after the action), so the reviewer can fix what was
 * refused and sign again.
 */
export function SignForm(props: {
  testId: number;
  reportId: number;
  revision: number;
  sections: { id: string; title: string }[];
  texts: Record<string, string>;
  acks: Record<string, boolean>;
  dirty: boolean;
  /** The signed version this draft replaces: the form then asks for the reason for the amendment. */
  amends?: { version: number; words: string };
  /** Signed in: the name is the account's and is not typed; a physiologist account cannot sign. */
  signAs?: SignAs;
  onResult: (state: SignState) => void;
}) {
  const [state, action, pending] = useActionState<SignState, FormData>(signReportAction, {});
  const [signer, setSigner] = useState(state.values?.signer ?? "");
  const [reason, setReason] = useState(state.values?.amendmentReason ?? "");
  const [attest, setAttest] = useState(false);
  const { onResult } = props;
  useEffect(() => onResult(state), [state, onResult]);
  const errors = state.errors ?? {};
  // the button is disabled while signing, which drops the keyboard focus: after a refusal it goes to the reason
  const reasonRef = useRef<HTMLSpanElement>(null);
  useEffect(() => {
    if (state.errors) reasonRef.current?.focus();
  }, [state]);
  const submit = (e: FormEvent<HTMLFormElement>) => {
    e.preventDefault();
    const data = new FormData(e.currentTarget);
    startTransition(() => action(data));
  };
  return (
    <form onSubmit={submit} className="stack" data-testid="sign-form">
      <input type="hidden" name="testId" value={props.testId} />
      <input type="hidden" name="reportId" value={props.reportId} />
      <input type="hidden" name="revision" value={props.revision} />
      {props.sections.map((s) => (
        <span key={s.id} hidden>
          <input type="hidden" name={`title:${s.id}`} value={s.title} />
          <input type="hidden" name={`section:${s.id}`} value={props.texts[s.id] ?? ""} />
          {props.acks[s.id] ? <input type="hidden" name={`rechecked:${s.id}`} value="on" /> : null}
        </span>
      ))}
      {props.dirty ? (
        <p className="sev-warning" data-testid="sign-unsaved-note" style={{ margin: 0 }}>
          The report text on screen has changes that are not saved yet. Signing saves the text exactly as it is on screen and
          signs that text; nothing else is signed.
        </p>
      ) : null}
      {props.signAs ? (
        <p data-testid="sign-as">
          You sign as <strong>{props.signAs.displayName}</strong> (account &ldquo;{props.signAs.username}&rdquo;,{" "}
          {props.signAs.role}).
          <input type="hidden" name="signer" value={props.signAs.displayName} />
          {props.signAs.role === "clinician" ? (
            <label style={{ display: "block", marginTop: "0.4rem" }}>
              Your password (confirms the signature)
              <input
                type="password"
                name="password"
                autoComplete="current-password"
                required
                data-testid="sign-password"
                aria-invalid={errors.password ? true : undefined}
              />
              {errors.password ? <span className="sev-error">{errors.password}</span> : null}
            </label>
          ) : null}
          {props.signAs.role !== "clinician" ? (
            <span className="sev-warning" data-testid="sign-role-note">
              {" "}
              Only a clinician account can sign: save the draft for a clinician to review and sign.
            </span>
          ) : null}
        </p>
      ) : (
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
          {signer.trim() !== "" && toPdfText(signer.trim()) !== signer.trim().normalize("NFC") ? (
            // the PDF's font lacks a few letters and signs and prints a stand-in (ǎ → a, ✓ → yes): said before signing
            <span className="how" data-testid="signer-pdf-form">
              In the PDF the name prints as “{toPdfText(signer.trim())}”.
            </span>
          ) : null}
          <span className="how">{SIGNER_NOT_VERIFIED}</span>
        </label>
      )}
      {props.amends ? (
        <label>
          Reason for the amendment (replaces {props.amends.words})
          <textarea
            name="amendmentReason"
            data-testid="amendment-reason"
            rows={2}
            maxLength={AMENDMENT_REASON_MAX_CHARS}
            value={reason}
            onChange={(e) => setReason(e.target.value)}
            aria-invalid={errors.amendmentReason ? true : undefined}
          />
          {errors.amendmentReason ? <span className="sev-error">{errors.amendmentReason}</span> : null}
          <span className="how">
            Printed on the first page of the amended report, with the reported values that differ from version{" "}
            {props.amends.version}.
          </span>
        </label>
      ) : null}
      <label style={{ display: "flex", gap: "0.5rem", alignItems: "flex-start" }}>
        <input
          type="checkbox"
          name="attest"
          data-testid="attest"
          checked={attest}
          onChange={(e) => setAttest(e.target.checked)}
        />
        <span>{ATTESTATION}</span>
      </label>
      {state.errors ? (
        <span ref={reasonRef} tabIndex={-1} className="stack" data-testid="sign-refusal">
          {errors.attest ? <span className="sev-error">{errors.attest}</span> : null}
          {errors.amendmentReason && !errors.form ? (
            <span className="sev-error" role="alert">
              Not signed: {errors.amendmentReason}
            </span>
          ) : null}
          {errors.signer ? (
            <span className="sev-error" role="alert">
              Not signed: {errors.signer}
            </span>
          ) : null}
          {errors.text ? (
            <span className="sev-error" role="alert" data-testid="sign-error-text">
              {errors.text}
            </span>
          ) : null}
          {errors.form ? (
            <span className="sev-error" role="alert" data-testid="sign-error">
              {errors.form}
            </span>
          ) : null}
        </span>
      ) : null}
      <div>
        <button
          type="submit"
          disabled={pending || (props.signAs !== undefined && props.signAs.role !== "clinician")}
          data-testid="sign-submit"
        >
          {pending ? "Signing…" : props.dirty ? "Save the text on screen and sign" : "Sign the report"}
        </button>
      </div>
    </form>
  );
}
