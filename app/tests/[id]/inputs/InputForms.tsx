"use client";

import { useActionState, useRef } from "react";
import { KeptNotice } from "../../../components/KeptNotice";
import { useKeptForm } from "../../../components/useKeptForm";
import type { Issue } from "@/lib/core";
import styles from "../columns/columns.module.css";
import { ImportIssueTable } from "../columns/ImportIssueTable";
import { addBloodGasFile, addLactateFile, saveConduct, saveContext, saveSpirometry, type InputFormState } from "./actions";

type Action = (prev: InputFormState, form: FormData) => Promise<InputFormState>;

function Messages({ state, testId }: { state: InputFormState; testId: string }) {
  const err = state.errors ?? {};
  return (
    <>
      {Object.entries(err).map(([k, m]) => (
        <p
          key={k}
          className="sev-error"
          role="alert"
          style={{ padding: "0.3rem", margin: "0.3rem 0" }}
          data-testid={`${testId}-error`}
        >
          {m}
        </p>
      ))}
      {state.ok ? (
        <p className="sev-info" style={{ padding: "0.3rem", margin: "0.3rem 0" }} data-testid={`${testId}-ok`}>
          {state.ok}
        </p>
      ) : null}
      {state.issues && state.issues.length > 0 ? (
        <ImportIssueTable issues={state.issues as Issue[]} testId={`${testId}-issues`} />
      ) : null}
    </>
  );
}

function useForm(action: Action) {
  return useActionState<InputFormState, FormData>(action, {});
}

export function LactateForm({ testId }: { testId: number }) {
  const [state, action, pending] = useForm(addLactateFile);
  const v = state.values ?? {};
  return (
    <form action={action} className="stack" data-testid="lactate-form" key={state.stamp ?? 0}>
      <input type="hidden" name="testId" value={testId} />
      <div className="row">
        <label className={styles.label}>
          Lactate file (time or stage or work rate, and lactate; CSV, TSV, semicolon, XLSX)
          <input type="file" name="file" accept=".csv,.tsv,.txt,.xlsx" data-testid="lactate-file" />
        </label>
        <label className={styles.label}>
          Plain-number times are in
          <select name="timeUnit" defaultValue={v.timeUnit ?? "s"}>
            <option value="s">seconds</option>
            <option value="min">minutes</option>
          </select>
        </label>
        <label className={styles.label}>
          Lactate unit when the header gives none
          <select name="lactateUnit" defaultValue={v.lactateUnit ?? ""} data-testid="lactate-unit">
            <option value="">read from the header or the values</option>
            <option value="mmol/L">mmol/L</option>
            <option value="mg/dL">mg/dL</option>
          </select>
        </label>
        <button type="submit" disabled={pending} data-testid="lactate-submit">
          {pending ? "Reading…" : "Read and save the samples"}
        </button>
      </div>
      <Messages state={state} testId="lactate" />
    </form>
  );
}

export function BloodGasForm({ testId }: { testId: number }) {
  const [state, action, pending] = useForm(addBloodGasFile);
  const v = state.values ?? {};
  return (
    <form action={action} className="stack" data-testid="bloodgas-form" key={state.stamp ?? 0}>
      <input type="hidden" name="testId" value={testId} />
      <div className="row">
        <label className={styles.label}>
          Blood gas file (time and/or label such as rest, peak, stage 3; PaO2, PaCO2 in mmHg or kPa)
          <input type="file" name="file" accept=".csv,.tsv,.txt,.xlsx" data-testid="bloodgas-file" />
        </label>
        <label className={styles.label}>
          Plain-number times are in
          <select name="timeUnit" defaultValue={v.timeUnit ?? "s"} data-testid="bloodgas-time-unit">
            <option value="s">seconds</option>
            <option value="min">minutes</option>
          </select>
        </label>
        <button type="submit" disabled={pending} data-testid="bloodgas-submit">
          {pending ? "Reading…" : "Read and save the blood gases"}
        </button>
      </div>
      <Messages state={state} testId="bloodgas" />
    </form>
  );
}

function NumberField({
  name,
  label,
  current,
  values,
  error,
  integer,
}: {
  name: string;
  label: string;
  current: number | undefined;
  values: Record<string, string>;
  error?: string;
  integer?: boolean;
}) {
  return (
    <label className={styles.label}>
      {label}
      <input
        name={name}
        type="number"
        step={integer ? 1 : "any"}
        size={6}
        defaultValue={values[name] ?? (current !== undefined ? String(current) : "")}
        aria-invalid={error ? true : undefined}
      />
    </label>
  );
}

export interface SpirometryValues {
  fev1L?: number;
  fvcL?: number;
  mvvLMin?: number;
  fev1PctPred?: number;
  dlcoPctPred?: number;
}

export function SpirometryForm({
  testId,
  current,
  recordToken,
}: {
  testId: number;
  current: SpirometryValues;
  recordToken: string;
}) {
  const [state, action, pending] = useForm(saveSpirometry);
  const formRef = useRef<HTMLFormElement>(null);
  const kept = useKeptForm(formRef, `spirometry-${testId}`, state.stamp ?? 0, Boolean(state.errors));
  const v = state.values ?? {};
  const e = state.errors ?? {};
  return (
    <form action={action} className="stack" data-testid="spirometry-form" key={state.stamp ?? 0} ref={formRef}>
      <KeptNotice kept={kept} testId="form-restored" />
      <input type="hidden" name="testId" value={testId} />
      <input type="hidden" name="recordToken" value={recordToken} />
      <div className="row">
        <NumberField name="fev1L" label="FEV1 (L)" current={current.fev1L} values={v} error={e.fev1L} />
        <NumberField name="fvcL" label="FVC (L)" current={current.fvcL} values={v} error={e.fvcL} />
        <NumberField name="mvvLMin" label="Measured MVV (L/min)" current={current.mvvLMin} values={v} error={e.mvvLMin} />
        <NumberField
          name="fev1PctPred"
          label="FEV1 (% predicted)"
          current={current.fev1PctPred}
          values={v}
          error={e.fev1PctPred}
        />
        <NumberField
          name="dlcoPctPred"
          label="DLCO (% predicted)"
          current={current.dlcoPctPred}
          values={v}
          error={e.dlcoPctPred}
        />
        <button type="submit" disabled={pending} data-testid="spirometry-submit">
          Save spirometry
        </button>
      </div>
      <Messages state={state} testId="spirometry" />
    </form>
  );
}

export interface ContextValues {
  ischaemicHeartDisease?: boolean;
  resectedSegments?: number;
  stairClimbM?: number;
  shuttleWalkM?: number;
  betaBlocker?: boolean;
  atrialFibrillation?: boolean;
  haemoglobinGDl?: number;
}

const yn = (b: boolean | undefined) => (b === undefined ? "" : b ? "yes" : "no");

export function ContextForm({ testId, current, recordToken }: { testId: number; current: ContextValues; recordToken: string }) {
  const [state, action, pending] = useForm(saveContext);
  const formRef = useRef<HTMLFormElement>(null);
  const kept = useKeptForm(formRef, `context-${testId}`, state.stamp ?? 0, Boolean(state.errors));
  const v = state.values ?? {};
  const e = state.errors ?? {};
  return (
    <form action={action} className="stack" data-testid="context-form" key={state.stamp ?? 0} ref={formRef}>
      <KeptNotice kept={kept} testId="form-restored" />
      <input type="hidden" name="testId" value={testId} />
      <input type="hidden" name="recordToken" value={recordToken} />
      <div className="row">
        <label className={styles.label}>
          Ischaemic heart disease
          <select name="ischaemicHeartDisease" defaultValue={v.ischaemicHeartDisease ?? yn(current.ischaemicHeartDisease)}>
            <option value="">not stated</option>
            <option value="yes">yes</option>
            <option value="no">no</option>
          </select>
        </label>
        <NumberField
          name="resectedSegments"
          label="Segments to be resected (0–19)"
          current={current.resectedSegments}
          values={v}
          error={e.resectedSegments}
          integer
        />
        <NumberField
          name="stairClimbM"
          label="Stair climb height (m)"
          current={current.stairClimbM}
          values={v}
          error={e.stairClimbM}
        />
        <NumberField
          name="shuttleWalkM"
          label="Shuttle walk distance (m)"
          current={current.shuttleWalkM}
          values={v}
          error={e.shuttleWalkM}
        />
      </div>
      <div className="row">
        <label className={styles.label}>
          Beta-blocker or other rate-limiting drug
          <select name="betaBlocker" defaultValue={v.betaBlocker ?? yn(current.betaBlocker)}>
            <option value="">not stated</option>
            <option value="yes">yes</option>
            <option value="no">no</option>
          </select>
        </label>
        <label className={styles.label}>
          Atrial fibrillation or other irregular rhythm during the test
          <select
            name="atrialFibrillation"
            defaultValue={v.atrialFibrillation ?? yn(current.atrialFibrillation)}
            data-testid="atrial-fibrillation"
          >
            <option value="">not stated</option>
            <option value="yes">yes</option>
            <option value="no">no</option>
          </select>
        </label>
        <NumberField
          name="haemoglobinGDl"
          label="Haemoglobin (g/dL)"
          current={current.haemoglobinGDl}
          values={v}
          error={e.haemoglobinGDl}
        />
        <button type="submit" disabled={pending} data-testid="context-submit">
          Save clinical context
        </button>
      </div>
      <Messages state={state} testId="context" />
    </form>
  );
}

export interface ConductValues {
  protocol?: string;
  reasonForStopping?: string;
  symptoms?: string;
  peakBorg?: number;
  bloodPressure?: string;
  ecgNotes?: string;
  notes?: string;
  apparatusDeadSpaceMl?: number;
  barometricPressureMmHg?: number;
}

export function ConductForm({ testId, current, recordToken }: { testId: number; current: ConductValues; recordToken: string }) {
  const [state, action, pending] = useForm(saveConduct);
  const formRef = useRef<HTMLFormElement>(null);
  const kept = useKeptForm(formRef, `conduct-${testId}`, state.stamp ?? 0, Boolean(state.errors));
  const v = state.values ?? {};
  const e = state.errors ?? {};
  const text = (name: keyof ConductValues) => v[name] ?? (current[name] !== undefined ? String(current[name]) : "");
  return (
    <form action={action} className="stack" data-testid="conduct-form" key={state.stamp ?? 0} ref={formRef}>
      <KeptNotice kept={kept} testId="form-restored" />
      <input type="hidden" name="testId" value={testId} />
      <input type="hidden" name="recordToken" value={recordToken} />
      <div className="row">
        <label className={styles.label}>
          Protocol
          <input name="protocol" size={28} defaultValue={text("protocol")} placeholder="e.g. cycle ramp 15 W/min" />
        </label>
        <label className={styles.label}>
          Reason for stopping
          <input name="reasonForStopping" size={28} defaultValue={text("reasonForStopping")} />
        </label>
        <NumberField
          name="peakBorg"
          label="Peak Borg rating (6–20)"
          current={current.peakBorg}
          values={v}
          error={e.peakBorg}
          integer
        />
      </div>
      <div className="row">
        <label className={styles.label}>
          Symptoms
          <input name="symptoms" size={28} defaultValue={text("symptoms")} />
        </label>
        <label className={styles.label}>
          Blood pressure (rest, peak, recovery)
          <input name="bloodPressure" size={28} defaultValue={text("bloodPressure")} placeholder="e.g. 130/80, 185/85, 140/80" />
        </label>
        <NumberField
          name="apparatusDeadSpaceMl"
          label="Apparatus dead space, mL (valve, mouthpiece or mask; subtracted in VD/VT)"
          current={current.apparatusDeadSpaceMl}
          values={v}
          error={e.apparatusDeadSpaceMl}
        />
        <NumberField
          name="barometricPressureMmHg"
          label="Barometric pressure, mmHg (for P(A−a)O2; sea level if empty)"
          current={current.barometricPressureMmHg}
          values={v}
          error={e.barometricPressureMmHg}
        />
      </div>
      <label className={styles.label}>
        ECG notes
        <textarea name="ecgNotes" rows={2} defaultValue={text("ecgNotes")} />
      </label>
      <label className={styles.label}>
        Other notes
        <textarea name="notes" rows={2} defaultValue={text("notes")} />
      </label>
      <div>
        <button type="submit" disabled={pending} data-testid="conduct-submit">
          Save test conduct
        </button>
      </div>
      <Messages state={state} testId="conduct" />
    </form>
  );
}
