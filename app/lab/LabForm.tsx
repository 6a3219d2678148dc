"use client";

import { useActionState } from "react";
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
}

export function LabForm({ quantities, current, cutoffChoices }: LabFormProps) {
  const [state, action, pending] = useActionState<LabFormState, FormData>(saveLab, {});
  return (
    <form action={action} className="stack" data-testid="lab-form" style={{ maxWidth: 960 }}>
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
      {cutoffChoices.map((c) => (
        <label key={c.id}>
          {c.label}
          <select name={`choice:${c.id}`} defaultValue={current.choices[c.id] ?? c.defaultOptionId}>
            {c.options.map((o) => (
              <option key={o.id} value={o.id}>
                {o.label}
                {o.id === c.defaultOptionId ? " (default)" : ""}
              </option>
            ))}
          </select>
          <span className="how">{c.description}</span>
        </label>
      ))}
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
      {Object.entries(state.errors ?? {}).map(([k, m]) => (
        <span key={k} className="sev-error">
          {m}
        </span>
      ))}
      {state.ok ? <span className="sev-info">{state.ok}</span> : null}
      <div>
        <button type="submit" disabled={pending}>
          Save lab defaults
        </button>
      </div>
    </form>
  );
}
