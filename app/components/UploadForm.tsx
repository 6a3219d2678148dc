"use client";

import { useActionState, useEffect, useState } from "react";
import { ErgometerReferralFields } from "./ErgometerReferralFields";
import { uploadTest, type UploadState } from "../actions";

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
  const v = state.values ?? {};
  const err = state.errors ?? {};
  return (
    <form action={action} className="stack" data-testid="upload-form">
      <label>
        Exercise test file (CSV, TSV, semicolon, XLSX)
        <input type="file" name="file" data-testid="upload-file" accept=".csv,.tsv,.txt,.xlsx" />
        {state.uploadId ? (
          <span className="how" data-testid="upload-kept">
            Kept on the server: {state.fileName}. Fix the fields below and submit again; you do not need to choose the file again.
          </span>
        ) : null}
        {err.file ? <span className="sev-error">{err.file}</span> : null}
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
      </div>
      {["fev1L", "mvvLMin"].map((k) =>
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
