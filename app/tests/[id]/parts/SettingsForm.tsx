"use client";

import { useActionState, useRef } from "react";
import { KeptNotice } from "../../../components/KeptNotice";
import { useKeptForm } from "../../../components/useKeptForm";
import { CutoffChoiceFields, FormMessages } from "../../../components/CutoffChoiceFields";
import { saveSettings, type FormState } from "../actions";

export interface SettingsFormProps {
  testId: number;
  current: {
    averaging: string;
    peakWindowS: number;
    vo2Equation: string;
    hrEquation: string;
    mvvChoice: string;
    choices: Record<string, string>;
  };
  vo2Equations: { id: string; label: string }[];
  hrEquations: { id: string; label: string }[];
  cutoffChoices: {
    id: string;
    label: string;
    description: string;
    defaultOptionId: string;
    options: { id: string; label: string }[];
  }[];
  /** The analysis version the page shows (`settingsToken`): a save from a stale page is refused. */
  versionToken: string;
}

const AVERAGING: [string, string][] = [
  ["none", "breath by breath (no averaging)"],
  ["rolling-30", "30-s rolling time window"],
  ["bin-10", "10-s time bins"],
  ["bin-20", "20-s time bins"],
  ["bin-30", "30-s time bins"],
  ["breaths-7", "7-breath rolling average"],
  ["middle-5-of-7", "middle 5 of 7 breaths"],
];

export function SettingsForm({ testId, current, vo2Equations, hrEquations, cutoffChoices, versionToken }: SettingsFormProps) {
  const [state, action, pending] = useActionState<FormState, FormData>(saveSettings, {});
  const formRef = useRef<HTMLFormElement>(null);
  // a changed choice and its reason are kept until saved: leaving asks first, Back and Forward put them back
  const kept = useKeptForm(formRef, `settings-${testId}`, state.stamp ?? 0, Boolean(state.errors));
  const v = state.values ?? {};
  return (
    <form action={action} className="stack" data-testid="settings-form" key={state.stamp ?? 0} ref={formRef}>
      <KeptNotice kept={kept} testId="settings-restored" />
      <input type="hidden" name="testId" value={testId} />
      <input type="hidden" name="versionToken" value={versionToken} />
      <div className="row">
        <label>
          Display averaging
          <select name="averaging" defaultValue={v.averaging ?? current.averaging}>
            {AVERAGING.map(([id, label]) => (
              <option key={id} value={id}>
                {label}
              </option>
            ))}
          </select>
        </label>
        <label>
          Peak window (s)
          <select name="peakWindowS" defaultValue={v.peakWindowS ?? String(current.peakWindowS)}>
            {[15, 20, 30, 60].map((s) => (
              <option key={s} value={s}>
                {s}
              </option>
            ))}
          </select>
        </label>
        <label>
          Breathing reserve from
          <select name="mvvChoice" defaultValue={v.mvvChoice ?? current.mvvChoice}>
            <option value="auto">measured MVV if given, else FEV1 × 40</option>
            <option value="measured">measured MVV</option>
            <option value="fev1x40">FEV1 × 40</option>
            <option value="fev1x35">FEV1 × 35</option>
          </select>
        </label>
      </div>
      <div className="row">
        <label>
          Predicted peak VO2
          <select name="vo2Equation" defaultValue={v.vo2Equation ?? current.vo2Equation}>
            {vo2Equations.map((e) => (
              <option key={e.id} value={e.id}>
                {e.label}
              </option>
            ))}
          </select>
        </label>
        <label>
          Predicted maximal HR
          <select name="hrEquation" defaultValue={v.hrEquation ?? current.hrEquation}>
            {hrEquations.map((e) => (
              <option key={e.id} value={e.id}>
                {e.label}
              </option>
            ))}
          </select>
        </label>
      </div>
      <h3>Cut-offs where published sources disagree</h3>
      <CutoffChoiceFields choices={cutoffChoices} selected={(id) => v[`choice:${id}`] ?? current.choices[id]} />
      <label>
        Why the change (kept with the version)
        <input name="note" defaultValue={v.note ?? ""} />
      </label>
      <FormMessages errors={state.errors} ok={state.ok} />
      <div>
        <button type="submit" disabled={pending}>
          Save as a new analysis version
        </button>
      </div>
    </form>
  );
}
