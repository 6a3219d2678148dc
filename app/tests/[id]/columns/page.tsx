import Link from "next/link";
import { notFound } from "next/navigation";
import { ColumnForm } from "./ColumnForm";
import { ImportIssueTable } from "./ImportIssueTable";
import { loadColumnReview } from "./loadColumnReview";
import { pageAccess } from "../../../access";
import { auditTestViewed } from "@/lib/store/reports";

export const dynamic = "force-dynamic";

const KIND_TEXT: Record<string, string> = {
  csv: "comma-separated text",
  semicolon: "semicolon-separated text",
  tsv: "tab-separated text",
  pipe: "pipe-separated text",
  whitespace: "columns aligned with spaces",
  xlsx: "Excel workbook",
};

export default async function ColumnReviewPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const access = await pageAccess(`/tests/${id}/columns`);
  const testId = Number(id);
  if (!Number.isInteger(testId) || testId <= 0) notFound();
  const review = await loadColumnReview(testId);
  if (!review) notFound();
  auditTestViewed(access.actor, testId, "columns");
  const { test, format } = review;
  const refused = !test.record;
  const meta = format ? Object.entries(format.metadata) : [];

  return (
    <>
      <h1 data-testid="columns-title">How the file was read — {test.label}</h1>
      <p className="row">
        <Link href={`/tests/${testId}`}>{refused ? "← back to the refused test" : "← back to the analysis"}</Link>
        <Link href={`/tests/${testId}/patient`} data-testid="patient-link">
          Patient and test details
        </Link>
        {!refused ? <Link href={`/tests/${testId}/inputs`}>Lactate, blood gases, spirometry and context →</Link> : null}
        <Link href="/profiles">Saved mapping profiles</Link>
        {test.uploadId ? <a href={`/api/uploads/${test.uploadId}`}>original file</a> : null}
      </p>
      <section className="panel" data-testid="file-facts">
        <p style={{ marginTop: 0 }}>
          File <strong>{review.fileName}</strong>
          {format ? (
            <>
              {" "}
              · {KIND_TEXT[format.kind] ?? format.kind} · decimal mark “{format.decimalMark}” · {review.rows.length} columns
              {format.metadataLines > 0 ? ` · ${format.metadataLines} line(s) of details above the header` : ""}
            </>
          ) : null}
          {" · "}
          <span className={refused ? "sev-error" : "tag"} data-testid="import-status">
            {refused ? "refused: not usable yet" : "imported"}
          </span>
        </p>
        {meta.length > 0 ? (
          <p className="how" style={{ marginBottom: 0 }}>
            Details found above the header: {meta.map(([k, v]) => `${k}: ${v}`).join(" · ")}
          </p>
        ) : null}
        {review.choices?.profileName ? (
          <p className="how" style={{ marginBottom: 0 }} data-testid="profile-used">
            Read with the mapping profile “{review.choices.profileName}”.
          </p>
        ) : null}
        <p className="how" style={{ marginBottom: 0 }}>
          The original file is kept exactly as uploaded; re-reading it with other choices never changes it. Each column says what
          it was read as and why: by the plain column convention, by a recognised name (with the unit from the header, a units row
          or the size of the values), or as set by you.
        </p>
      </section>

      {refused ? (
        <p className="sev-warning" style={{ padding: "0.5rem" }} data-testid="refused-what-next">
          {/* what to do first: only the test to choose when that is the one problem, else the columns it lacks */}
          {review.issues.some((i) => i.code === "several-records") &&
          !review.issues.some((i) => i.code === "no-vo2-column" || i.code === "no-time-column")
            ? "This file holds several tests. Choose the one to import (the test's identifier below), then re-read it."
            : "This file could not be used as read automatically. Say what each needed column holds (at least time and VO2), then re-read it."}
        </p>
      ) : null}

      {format ? (
        <ColumnForm
          testId={testId}
          rows={review.rows}
          fields={review.fields}
          record={review.record}
          weightKg={review.weightKg}
          perKgColumn={review.perKgColumn}
          stageOrder={review.stageOrder}
          stageDurationS={review.stageDurationS}
          refused={refused}
          details={review.details}
        />
      ) : (
        <p className="sev-error" style={{ padding: "0.5rem" }}>
          The kept file cannot be read as a table at all, so there are no columns to map. See the problems below, then export the
          test again from the recording system as a CSV or XLSX file and upload that file from the{" "}
          <Link href="/">test register</Link>.
        </p>
      )}

      <h2>Problems found when the file was last read</h2>
      <ImportIssueTable issues={review.issues} testId="import-issues" />
    </>
  );
}
