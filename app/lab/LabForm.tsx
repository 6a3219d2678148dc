"use client";

import { useActionState, useRef } from "react";
import { KeptNotice } from "../components/KeptNotice";
import { useKeptForm } from "../components/useKeptForm";
import { CutoffChoiceFields, FormMessages } from "../components/CutoffChoiceFields";
import { saveLab, type LabFormState } from "./actions";

export interface LabFormProps {
  quantities: {
    id: string;
    label: string;
    options: { cycle: { id: string; label: string }[]; treadmill: { id: string; label: string }[] };
  }[];
  current: {
    equations: Record<string, Record<string, string | undefined>>;
    choices: Record<string, string>;
    peakWindowS: number;
  };
  cutoffChoices: {
    id: string;
    label: string;
    description: string;
    defaultOptionId: string;
    options: { id: string; label: string }[];
  }[];
  /** Which version of the lab defaults this page shows (`labDefaultsToken`), sent back with the save. */
  labToken: string;
}

export function LabForm({ quantities, current, cutoffChoices, labToken }: LabFormProps) {
  const [state, action, pending] = useActionState<LabFormState, FormData>(saveLab, {});
  const formRef = useRef<HTMLFormElement>(null);
  // changed defaults are kept until saved: leaving asks first, Back and Forward put them back (the form is not
  // re-mounted after an answer, so a refused save keeps what was chosen)
  const kept = useKeptForm(formRef, "lab-defaults", state.stamp ?? 0, Boolean(state.errors));
  return (
    <form action={action} className="stack" data-testid="lab-form" style={{ maxWidth: 960 }} ref={formRef}>
      <KeptNotice kept={kept} testId="lab-restored" />
      <input type="hidden" name="labToken" value={labToken} />
      <h2>Predicted-value equations</h2>
      <table>
        <thead>
          <tr>
            <th>Quantity</th>
            <th>Cycle</th>
            <th>Treadmill</th>
          </tr>
        </thead>
        <tbody>
          {quantities.map((q) => (
            <tr key={q.id}>
              <td>{q.label}</td>
              {(["cycle", "treadmill"] as const).map((erg) => (
                <td key={erg}>
                  {q.options[erg].length > 0 ? (
                    <select
                      name={`eq:${q.id}:${erg}`}
                      defaultValue={current.equations[q.id]?.[erg] ?? ""}
                      aria-label={`${q.label}, ${erg}`}
                    >
                      {q.options[erg].map((o) => (
                        <option key={o.id} value={o.id}>
                          {o.label}
                        </option>
                      ))}
                    </select>
                  ) : (
                    <span className="how">no equation</span>
                  )}
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
      <h2>Cut-offs where published sources disagree</h2>
      <CutoffChoiceFields choices={cutoffChoices} selected={(id) => current.choices[id]} />
      <div className="row">
        <label>
          Peak averaging window (s)
          <select name="peakWindowS" defaultValue={String(current.peakWindowS)}>
            {[15, 20, 30, 60].map((s) => (
              <option key={s} value={s}>
                {s}
              </option>
            ))}
          </select>
        </label>
        <label>
          Changed by
          <input name="by" />
        </label>
      </div>
      <FormMessages errors={state.errors} ok={state.ok} />
      <div>
        <button type="submit" disabled={pending}>
          Save lab defaults
        </button>
      </div>
    </form>
  );
}
