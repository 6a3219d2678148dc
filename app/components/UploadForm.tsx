"use client";

import { useActionState, useEffect, useState } from "react";
import { ErgometerReferralFields } from "./ErgometerReferralFields";
import { useLeaveGuard } from "./useLeaveGuard";
import { uploadTest, type UploadState } from "../actions";
import { uploadFileProblem } from "../schemas";

/** The chosen file's size problem (empty, or over the upload limit) in plain words, or null. */
function chosenFileProblem(input: HTMLInputElement | null): string | null {
  const file = input?.files?.[0];
  return file ? uploadFileProblem(file) : null;
}

export function UploadForm() {
  const [state, action, pending] = useActionState<UploadState, FormData>(uploadTest, {});
  // Mapping profiles (saved on a test's column review page; listed by app/profiles/names/route.ts).
  const [profileNames, setProfileNames] = useState<string[]>([]);
  useEffect(() => {
    fetch("/profiles/names")
      .then((r) => (r.ok ? r.json() : []))
      .then((names: string[]) => setProfileNames(names))
      .catch(() => setProfileNames([]));
  }, []);
  // A refused upload returns every field as sent (`state.values`). The form is built afresh from them after each refusal
  // (the key), so selects, checkboxes and radio buttons show what the user chose, as text fields do: a select keeps the
  // option it was first drawn with when only its default value changes.
  return <UploadFields key={state.attempt ?? 0} state={state} action={action} pending={pending} profileNames={profileNames} />;
}

function UploadFields({
  state,
  action,
  pending,
  profileNames,
}: {
  state: UploadState;
  action: (form: FormData) => void;
  pending: boolean;
  profileNames: string[];
}) {
  // The browser's check of the chosen file (empty, or over the upload limit): shown at once, and it stops the form from
  // being sent, so nothing typed or chosen is lost and no oversize request reaches the server.
  const [fileProblem, setFileProblem] = useState<string | null>(null);
  // typed details and a chosen file are not sent until "Import and analyse": leaving before that asks first (a refused
  // upload comes back with its fields, which are unsaved too). Nothing is kept across pages: a file cannot be.
  const [dirty, setDirty] = useState(Boolean(state.errors));
  useLeaveGuard(dirty && !pending, "The upload form has details or a file that were not sent. Leave the page and lose them?");
  const v = state.values ?? {};
  const err = state.errors ?? {};
  const fileError = fileProblem ?? err.file;
  return (
    <form
      action={action}
      className="stack"
      data-testid="upload-form"
      // while the file is read, typing would be overwritten by the fields as sent when the answer comes back
      inert={pending}
      aria-busy={pending}
      onChange={() => setDirty(true)}
      onSubmit={(e) => {
        const problem = chosenFileProblem(e.currentTarget.elements.namedItem("file") as HTMLInputElement | null);
        if (problem) {
          e.preventDefault();
          setFileProblem(problem);
        }
      }}
    >
      <label>
        Exercise test file (CSV, TSV, semicolon, XLSX)
        <input
          type="file"
          name="file"
          data-testid="upload-file"
          accept=".csv,.tsv,.txt,.xlsx"
          aria-invalid={fileError ? true : undefined}
          aria-describedby={fileError ? "upload-file-error" : undefined}
          onChange={(e) => setFileProblem(chosenFileProblem(e.currentTarget))}
        />
        {state.uploadId ? (
          <span className="how" data-testid="upload-kept">
            Kept on the server: {state.fileName}. Fix the fields below and submit again; you do not need to choose the file again.
          </span>
        ) : null}
        {fileError ? (
          <span className="sev-error" id="upload-file-error" role="alert" data-testid="upload-file-error">
            {fileError}
          </span>
        ) : null}
      </label>
      {state.uploadId ? <input type="hidden" name="uploadId" value={state.uploadId} /> : null}
      {state.fileName ? <input type="hidden" name="uploadFileName" value={state.fileName} /> : null}
      <label>
        Mapping profile (column choices saved for this file layout)
        <select name="profile" key={profileNames.join("\n")} defaultValue={v.profile ?? ""} data-testid="upload-profile">
          <option value="">none: recognise the columns automatically</option>
          {profileNames.map((n) => (
            <option key={n} value={n}>
              {n}
            </option>
          ))}
        </select>
        {err.profile ? <span className="sev-error">{err.profile}</span> : null}
      </label>
      <label>
        Label (anonymised case name)
        <input name="label" defaultValue={v.label ?? ""} placeholder="e.g. Case 14, pre-op" />
      </label>
      <div className="row">
        <label>
          Sex
          <select name="sex" defaultValue={v.sex ?? ""}>
            <option value="">not given</option>
            <option value="male">male</option>
            <option value="female">female</option>
          </select>
        </label>
        <label>
          Age (years)
          <input name="ageY" type="number" step="any" defaultValue={v.ageY ?? ""} size={5} />
        </label>
        <label>
          Height (cm)
          <input name="heightCm" type="number" step="any" defaultValue={v.heightCm ?? ""} size={5} />
        </label>
        <label>
          Weight (kg)
          <input name="weightKg" type="number" step="any" defaultValue={v.weightKg ?? ""} size={5} />
        </label>
      </div>
      {["ageY", "heightCm", "weightKg", "sex"].map((k) =>
        err[k] ? (
          <span key={k} className="sev-error">
            {err[k]}
          </span>
        ) : null,
      )}
      <div className="row">
        <ErgometerReferralFields values={v} />
        <label>
          FEV1 (L)
          <input name="fev1L" type="number" step="any" defaultValue={v.fev1L ?? ""} size={5} />
        </label>
        <label>
          Measured MVV (L/min)
          <input name="mvvLMin" type="number" step="any" defaultValue={v.mvvLMin ?? ""} size={5} />
        </label>
        <label>
          Ischaemic heart disease
          <select name="ischaemicHeartDisease" defaultValue={v.ischaemicHeartDisease ?? ""} data-testid="upload-ihd">
            <option value="">not stated</option>
            <option value="yes">yes</option>
            <option value="no">no</option>
          </select>
          <span className="how">Read by the pre-operative risk schemes.</span>
        </label>
      </div>
      <label>
        Stage length (s), for a stage table without a time column
        <input
          name="stageDurationS"
          type="number"
          step="any"
          defaultValue={v.stageDurationS ?? ""}
          size={5}
          data-testid="upload-stage-duration"
        />
        <span className="how">
          Leave empty for breath-by-breath files. Without it, stages are read 60 s apart and the report says so.
        </span>
      </label>
      {["fev1L", "mvvLMin", "stageDurationS"].map((k) =>
        err[k] ? (
          <span key={k} className="sev-error">
            {err[k]}
          </span>
        ) : null,
      )}
      <div>
        <button type="submit" disabled={pending} data-testid="upload-submit">
          {pending ? "Reading the file…" : "Import and analyse"}
        </button>
      </div>
    </form>
  );
}
