import { FormMessages } from "../../../components/CutoffChoiceFields";

/**
 * The reviewer's name field of a reviewer form (threshold override, exercise phase). Signed in, the name is the
 * account's and is not typed (the server uses the account's name whatever a form sends).
 */
export function ReviewerField({ value, signedInName }: { value?: string; signedInName?: string }) {
  if (signedInName)
    return (
      <span className="how" data-testid="reviewer-signed-in">
        Reviewer: {signedInName} (signed in)
        <input type="hidden" name="by" value={signedInName} />
      </span>
    );
  return (
    <label>
      Reviewer
      <input name="by" defaultValue={value ?? ""} size={14} required minLength={2} />
    </label>
  );
}

/** The short reviewer-name input of a one-line form (put a span back, doubt VO2 again); hidden when signed in. */
export function ReviewerNameInput({ signedInName }: { signedInName?: string }) {
  if (signedInName) return <input type="hidden" name="by" value={signedInName} />;
  return <input name="by" required minLength={2} size={12} placeholder="your name" aria-label="Reviewer" />;
}

/** The short reason input of a one-line reviewer form (undo a decision: put a span back, remove an override). */
export function ShortReasonInput({ label = "Reason" }: { label?: string }) {
  return (
    <input
      name="reason"
      required
      minLength={3}
      maxLength={200}
      pattern=".*\S.*\S.*\S.*"
      title="Say why, in a few words"
      size={18}
      placeholder="why"
      aria-label={label}
    />
  );
}

/** Reason, messages and submit button that close a reviewer form. */
export function ReasonAndSubmit({
  value,
  placeholder,
  errors,
  ok,
  pending,
  submitLabel,
}: {
  value?: string;
  placeholder: string;
  errors: Record<string, string>;
  ok?: string;
  pending: boolean;
  submitLabel: string;
}) {
  return (
    <>
      <label>
        Reason
        {/* the browser asks first; the server refuses a blank or short reason anyway, with its own words */}
        <input name="reason" defaultValue={value ?? ""} placeholder={placeholder} required minLength={5} />
      </label>
      <FormMessages errors={errors} ok={ok} />
      <div>
        <button type="submit" disabled={pending}>
          {submitLabel}
        </button>
      </div>
    </>
  );
}
