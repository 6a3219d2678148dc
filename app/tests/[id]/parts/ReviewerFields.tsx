import { FormMessages } from "../../../components/CutoffChoiceFields";

/** The reviewer's name field of a reviewer form (threshold override, exercise phase). */
export function ReviewerField({ value }: { value?: string }) {
  return (
    <label>
      Reviewer
      <input name="by" defaultValue={value ?? ""} size={14} />
    </label>
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
        <input name="reason" defaultValue={value ?? ""} placeholder={placeholder} />
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
