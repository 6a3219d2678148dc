"use client";

import Link from "next/link";
import { useActionState, useRef } from "react";
import { KeptNotice } from "../../../components/KeptNotice";
import { useKeptForm } from "../../../components/useKeptForm";
import { ErgometerReferralFields } from "../../../components/ErgometerReferralFields";
import styles from "../columns/columns.module.css";
import { savePatientDetails, type PatientFormState } from "./actions";

export interface PatientFormProps {
  testId: number;
  /** Current values as form text ("" = not given). */
  current: Record<"sex" | "ageY" | "heightCm" | "weightKg" | "ergometer" | "referral", string>;
  /** The file gives VO2 per kg: VO2 in mL/min is recomputed from the weight. */
  perKg: boolean;
  /** The version of the test's details this page shows (`recordToken`): a save from a stale page is refused. */
  recordToken: string;
}

const FIELDS: { name: "ageY" | "heightCm" | "weightKg"; label: string }[] = [
  { name: "ageY", label: "Age (years)" },
  { name: "heightCm", label: "Height (cm)" },
  { name: "weightKg", label: "Weight (kg)" },
];

export function PatientForm(props: PatientFormProps) {
  const [state, action, pending] = useActionState<PatientFormState, FormData>(savePatientDetails, {});
  // After a refused save the typed values are shown again; after a save the page's new values are.
  const v = { ...props.current, ...state.values };
  const err = state.errors ?? {};
  const formRef = useRef<HTMLFormElement>(null);
  const kept = useKeptForm(formRef, `patient-${props.testId}`, state.stamp ?? 0, Boolean(state.errors));
  return (
    <form action={action} key={state.stamp ?? 0} ref={formRef} data-testid="patient-form" className="stack">
      <KeptNotice kept={kept} testId="patient-restored" />
      <input type="hidden" name="testId" value={props.testId} />
      <input type="hidden" name="recordToken" value={props.recordToken} />
      <div className="row">
        <label className={styles.label}>
          Sex
          <select name="sex" defaultValue={v.sex} data-testid="patient-sex">
            <option value="">not given</option>
            <option value="male">male</option>
            <option value="female">female</option>
          </select>
        </label>
        {FIELDS.map((f) => (
          <label key={f.name} className={styles.label}>
            {f.label}
            <input
              name={f.name}
              type="number"
              step="any"
              size={6}
              defaultValue={v[f.name]}
              data-testid={`patient-${f.name}`}
              aria-invalid={err[f.name] ? true : undefined}
            />
          </label>
        ))}
        <ErgometerReferralFields values={v} labelClassName={styles.label} />
      </div>
      {["sex", "ageY", "heightCm", "weightKg", "ergometer", "referral", "form"].map((k) =>
        err[k] ? (
          <p
            key={k}
            className="sev-error"
            role="alert"
            data-testid={`patient-error-${k}`}
            style={{ padding: "0.4rem", margin: 0 }}
          >
            {err[k]}
          </p>
        ) : null,
      )}
      {props.perKg ? (
        <p className="how">This file gives VO2 per kg of body mass: VO2 in mL/min is recomputed from the weight saved here.</p>
      ) : null}
      <div>
        <button type="submit" disabled={pending} data-testid="patient-save">
          {pending ? "Saving…" : "Save the details"}
        </button>
      </div>
      {state.ok ? (
        <p className="sev-info" data-testid="patient-ok" style={{ padding: "0.4rem" }}>
          {state.ok} <Link href={`/tests/${props.testId}`}>Open the test →</Link>
        </p>
      ) : null}
    </form>
  );
}
