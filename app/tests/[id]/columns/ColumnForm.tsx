"use client";

import Link from "next/link";
import { useActionState, useState } from "react";
import type { Issue } from "@/lib/core";
import type { UploadDetails } from "@/lib/store/reimport";
import { applyColumnChoices, type ColumnFormState } from "./actions";
import type { FieldOption } from "./fieldChoices";
import type { ColumnRowView } from "./loadColumnReview";
import styles from "./columns.module.css";
import { ImportIssueTable } from "./ImportIssueTable";
import { ErgometerReferralFields } from "../../../components/ErgometerReferralFields";

export interface ColumnFormProps {
  testId: number;
  rows: ColumnRowView[];
  fields: FieldOption[];
  record: { column: string; options: { value: string; rows: number }[]; chosen: string } | null;
  weightKg: number | undefined;
  perKgColumn: boolean;
  /** The file has no time column: its rows are read as consecutive stages, this many seconds apart. */
  stageOrder: boolean;
  stageDurationS: number | undefined;
  /** Refused tests have no record: the form shows the details entered with the upload, to check before re-reading. */
  refused: boolean;
  /** Details entered with the refused upload (null when none were kept). */
  details: UploadDetails | null;
}

export function ColumnForm(props: ColumnFormProps) {
  const [state, action, pending] = useActionState<ColumnFormState, FormData>(applyColumnChoices, {});
  return (
    <form action={action} data-testid="column-form">
      <input type="hidden" name="testId" value={props.testId} />
      <ColumnFormBody key={state.stamp ?? 0} {...props} state={state} pending={pending} />
    </form>
  );
}

function ColumnFormBody(props: ColumnFormProps & { state: ColumnFormState; pending: boolean }) {
  const { state, pending } = props;
  const kept = props.details;
  // What the user sent last wins; else the details kept with the refused upload.
  const v: Record<string, string> = {
    ...(kept
      ? {
          sex: kept.patient.sex ?? "",
          ageY: kept.patient.ageY !== undefined ? String(kept.patient.ageY) : "",
          heightCm: kept.patient.heightCm !== undefined ? String(kept.patient.heightCm) : "",
          ergometer: kept.ergometer,
          referral: kept.referral,
        }
      : {}),
    ...state.values,
  };
  const err = state.errors ?? {};
  const fieldByKey = new Map(props.fields.map((f) => [f.value as string, f]));
  return (
    <>
      <table data-testid="column-review">
        <thead>
          <tr>
            <th>Column in the file</th>
            <th>First values as found</th>
            <th>Read as</th>
            <th>Why, and who decided</th>
            <th>Your choice</th>
          </tr>
        </thead>
        <tbody>
          {props.rows.map((r) => (
            <ColumnRow
              key={r.index}
              row={r}
              fields={props.fields}
              fieldByKey={fieldByKey}
              field={v[`col.${r.index}.field`] ?? r.choiceField}
              unit={v[`col.${r.index}.unit`] ?? r.choiceUnit}
              error={err[`col.${r.index}`]}
            />
          ))}
        </tbody>
      </table>

      <div className="row" style={{ marginTop: "1rem" }}>
        {props.record ? (
          <label className={styles.label}>
            Test to use (column “{props.record.column}”)
            <input type="hidden" name="selectColumn" value={props.record.column} />
            <select name="selectValue" defaultValue={v.selectValue ?? props.record.chosen} data-testid="record-select">
              <option value="">— choose one test —</option>
              {props.record.options.map((o) => (
                <option key={o.value} value={o.value}>
                  {o.value} ({o.rows} rows)
                </option>
              ))}
            </select>
            {err.selectValue ? <span className="sev-error">{err.selectValue}</span> : null}
          </label>
        ) : null}
        <label className={styles.label}>
          Body mass for per-kg VO2 columns (kg){props.perKgColumn ? " — this file has one" : ""}
          <input
            name="weightKg"
            type="number"
            step="any"
            size={6}
            className={styles.weight}
            defaultValue={v.weightKg ?? (props.weightKg !== undefined ? String(props.weightKg) : "")}
            data-testid="weight"
          />
          {err.weightKg ? <span className="sev-error">{err.weightKg}</span> : null}
        </label>
        {props.stageOrder ? (
          <label className={styles.label}>
            Length of each stage (s) — this file has no time column, so its rows are read as consecutive stages
            <input
              name="stageDurationS"
              type="number"
              step="any"
              size={6}
              className={styles.weight}
              placeholder="60"
              defaultValue={v.stageDurationS ?? (props.stageDurationS !== undefined ? String(props.stageDurationS) : "")}
              data-testid="stage-duration"
            />
            {err.stageDurationS ? <span className="sev-error">{err.stageDurationS}</span> : null}
          </label>
        ) : null}
      </div>
      {!props.refused ? (
        <p className="how">The body mass entered here also becomes the patient&apos;s weight for this test.</p>
      ) : null}

      {props.refused ? (
        <fieldset className="panel">
          <legend>
            Patient and test details{" "}
            {kept ? "(as entered with the upload; check them before re-reading)" : "(none were kept with this upload)"}
          </legend>
          <div className="row">
            <label className={styles.label}>
              Sex
              <select name="sex" defaultValue={v.sex ?? ""} data-testid="refused-sex">
                <option value="">not given</option>
                <option value="male">male</option>
                <option value="female">female</option>
              </select>
            </label>
            <label className={styles.label}>
              Age (years)
              <input name="ageY" type="number" step="any" size={5} defaultValue={v.ageY ?? ""} data-testid="refused-age" />
            </label>
            <label className={styles.label}>
              Height (cm)
              <input
                name="heightCm"
                type="number"
                step="any"
                size={5}
                defaultValue={v.heightCm ?? ""}
                data-testid="refused-height"
              />
            </label>
            <ErgometerReferralFields values={v} labelClassName={styles.label} />
          </div>
          {["sex", "ageY", "heightCm", "ergometer", "referral"].map((k) =>
            err[k] ? (
              <div key={k} className="sev-error">
                {err[k]}
              </div>
            ) : null,
          )}
        </fieldset>
      ) : null}

      <div className="row" style={{ marginTop: "1rem" }}>
        <button type="submit" name="intent" value="reread" disabled={pending} data-testid="reread">
          {pending ? "Reading…" : "Re-read the file with these choices"}
        </button>
      </div>
      {err.form ? (
        <p className="sev-error" data-testid="columns-error" style={{ padding: "0.4rem" }}>
          {err.form}
        </p>
      ) : null}
      {state.ok ? (
        <p className="sev-info" data-testid="columns-ok" style={{ padding: "0.4rem" }}>
          {state.ok} {!state.values ? <Link href={`/tests/${props.testId}`}>Open the analysis →</Link> : null}
        </p>
      ) : null}
      {state.issues && state.issues.length > 0 ? (
        <ImportIssueTable issues={state.issues as Issue[]} testId="reread-issues" />
      ) : null}

      <fieldset className="panel" style={{ marginTop: "1rem" }}>
        <legend>Save these choices as a mapping profile</legend>
        <p className="how" style={{ marginTop: 0 }}>
          A profile keeps the columns you changed from “automatic”, by header, and applies them to the next file of the same
          layout when you pick it on the upload form.
        </p>
        <div className="row">
          <label className={styles.label}>
            Profile name
            <input name="profileName" size={28} defaultValue={v.profileName ?? ""} data-testid="profile-name" />
          </label>
          <button
            type="submit"
            name="intent"
            value="save-profile"
            className="secondary"
            disabled={pending}
            data-testid="save-profile"
          >
            Save these choices as a profile
          </button>
          <Link href="/profiles">saved profiles</Link>
        </div>
        {err.profileName ? (
          <p className="sev-error" data-testid="profile-error" style={{ padding: "0.4rem" }}>
            {err.profileName}
          </p>
        ) : null}
      </fieldset>
    </>
  );
}

function ColumnRow({
  row,
  fields,
  fieldByKey,
  field: initialField,
  unit: initialUnit,
  error,
}: {
  row: ColumnRowView;
  fields: FieldOption[];
  fieldByKey: Map<string, FieldOption>;
  field: string;
  unit: string;
  error?: string;
}) {
  // Uncontrolled selects (defaultValue) so the form reset React does after an action keeps the shown choice;
  // the state only filters the units offered for the chosen field.
  const [field, setField] = useState(initialField);
  const [unit, setUnit] = useState(initialUnit);
  const effective = field === "auto" ? row.autoField : field === "ignore" ? null : field;
  const units = effective ? (fieldByKey.get(effective)?.units ?? []) : [];
  const changed = field !== "auto" || unit !== "auto";
  return (
    <tr data-testid={`col-${row.index}`} className={changed ? styles.userChoice : undefined}>
      <td>
        <strong>{row.header || <em>(no header)</em>}</strong>
        {row.unitsRow ? <div className="how">units row: {row.unitsRow}</div> : null}
      </td>
      <td className={styles.samples}>{row.samples.length > 0 ? row.samples.join(" · ") : "empty"}</td>
      <td data-testid="read-as">{row.readAs}</td>
      <td className="how" data-testid="reason">
        <span className="tag">{row.decidedBy}</span>
        {/^[;:,]/.test(row.reason) ? "" : " "}
        {row.reason}
      </td>
      <td>
        <div className="row" style={{ gap: "0.3rem" }}>
          <select
            name={`col.${row.index}.field`}
            defaultValue={initialField}
            onChange={(e) => {
              setField(e.target.value);
              setUnit(e.target.value === initialField ? initialUnit : "auto");
            }}
            aria-label={`What “${row.header}” holds`}
            data-testid="field-select"
          >
            <option value="auto">automatic: {row.autoLabel}</option>
            {fields.map((f) => (
              <option key={f.value} value={f.value}>
                {f.label}
              </option>
            ))}
            <option value="ignore">ignore this column</option>
          </select>
          <select
            key={field}
            name={`col.${row.index}.unit`}
            defaultValue={field === initialField ? initialUnit : "auto"}
            onChange={(e) => setUnit(e.target.value)}
            disabled={units.length === 0}
            aria-label={`Unit of “${row.header}”`}
            data-testid="unit-select"
          >
            <option value="auto">unit: from the file</option>
            {units.map((u) => (
              <option key={u.value} value={u.value}>
                {u.label}
              </option>
            ))}
          </select>
        </div>
        {error ? <div className="sev-error">{error}</div> : null}
      </td>
    </tr>
  );
}
