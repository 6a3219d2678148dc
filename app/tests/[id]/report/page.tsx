import Link from "next/link";
import { EVIDENCE_LABEL } from "@/lib/core";
import { signerIdentityNote } from "@/lib/report/caution";
import { EVIDENCE_LEGEND } from "@/lib/report/sources";
import { notFound } from "next/navigation";
import { Chart } from "../../../components/Chart";
import { IssueList } from "../../../components/IssueList";
import { TableScroll } from "../../../components/TableScroll";
import { DraftWorkspace } from "./DraftWorkspace";
import { loadReport } from "./loadReport";
import type { ReportModel } from "@/lib/report/reportModel";
import { amendmentWords } from "@/lib/report/amendmentWords";
import { ReportValuesTable } from "./ReportValuesTable";
import { REPORT_NOTICE_SLOT } from "./schemas";
import { formatUtcMinute } from "@/lib/units";
import { pageAccess } from "../../../access";
import { auditReportViewed } from "@/lib/store/reports";

export const dynamic = "force-dynamic";

const when = (iso: string | null | undefined) => (iso ? formatUtcMinute(iso) : "");

export default async function ReportPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const access = await pageAccess(`/tests/${id}/report`);
  const testId = Number(id);
  if (!Number.isInteger(testId) || testId <= 0) notFound();
  const loaded = loadReport(testId);
  if (!loaded) notFound();
  const { model, report, versions } = loaded;
  auditReportViewed(access.actor, testId, report);
  const signed = model.status === "signed";
  const recheck = model.sections.filter((s) => s.recheck);
  const sourceNumber = new Map(model.sources.map((s, i) => [s.id, i + 1]));
  // the signed version a draft would replace: signing it is an amendment, and the sign form asks why
  const earlierSigned = versions.find((v) => v.id < report.id && v.status === "signed");
  const amends =
    !signed && earlierSigned
      ? {
          version: earlierSigned.version,
          words: `version ${earlierSigned.version}, signed by ${earlierSigned.signedBy} on ${when(earlierSigned.signedAt)}`,
        }
      : undefined;

  return (
    <>
      <h1>{model.title}</h1>
      {signed ? (
        <p className="panel" data-testid="signed-by" id="signed-by" tabIndex={-1}>
          <strong>
            Signed by {model.signedBy} on {when(model.signedAt)}
          </strong>{" "}
          · version {report.version}
        </p>
      ) : (
        <p className="draftmark" data-testid="draft-mark">
          {model.draftMark}
        </p>
      )}
      {model.versionNote ? (
        <p className="how" data-testid="version-note">
          {model.versionNote}
        </p>
      ) : null}
      <AmendmentPanel model={model} />
      <div id={REPORT_NOTICE_SLOT} />
      {recheck.length ? (
        <p className="panel sev-warning" data-testid="recheck-banner">
          <strong>The analysis changed after the text was edited.</strong> Your text in{" "}
          {recheck.map((s) => `“${s.title}”`).join(", ")} was kept from report version {recheck[0].recheck!.fromVersion}, but the
          numbers it was written for have changed. Each of these sections is marked below with what changed; re-check it before
          signing.
        </p>
      ) : null}
      <p>
        <a href={`/api/tests/${testId}/report/pdf`} data-testid="pdf-link">
          Download the report as PDF
        </a>{" "}
        · <Link href={`/tests/${testId}`}>Back to the test</Link>
      </p>

      <section className="panel">
        <p style={{ margin: 0 }}>{model.patientLine}</p>
        <p style={{ margin: 0 }}>{model.testLine}</p>
        <p style={{ margin: 0 }}>Referral question: {model.referral}</p>
        <p className="how" style={{ margin: 0 }}>
          Analysis engine version {model.engineVersion}
        </p>
      </section>

      <h2>Key values</h2>
      <ReportValuesTable rows={model.keyValues} sourceNumber={sourceNumber} testId="report-key-values" label="Key values" />
      <h2>Thresholds</h2>
      {model.thresholds.length ? (
        <ReportValuesTable rows={model.thresholds} sourceNumber={sourceNumber} testId="report-thresholds" label="Thresholds" />
      ) : (
        <p className="how">No thresholds in this version of the analysis.</p>
      )}

      {model.charts.length ? (
        <>
          <h2>Charts</h2>
          <div style={{ display: "grid", gap: "1rem", maxWidth: 900 }}>
            {model.charts.map((c) => (
              <Chart key={c.id} spec={c} width={760} height={380} />
            ))}
          </div>
        </>
      ) : null}

      {model.path.length ? (
        <>
          <h2>Interpretation path</h2>
          <TableScroll label="Interpretation path">
            <table data-testid="report-path" className="wide report-values">
              <thead>
                <tr>
                  <th>Step</th>
                  <th>Variable</th>
                  <th>Value</th>
                  <th>Cut-off</th>
                  <th>Outcome</th>
                </tr>
              </thead>
              <tbody>
                {model.path.map((p) => (
                  <tr key={p.step}>
                    <td>{p.step}</td>
                    <td>{p.variable}</td>
                    <td>{p.value}</td>
                    <td>{p.cutoff}</td>
                    <td>{p.outcome}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </TableScroll>
        </>
      ) : null}
      {model.schemes.length ? (
        <>
          <h2>Classification schemes</h2>
          <ul>
            {model.schemes.map((s) => (
              <li key={s.name}>
                <strong>{s.name}</strong>: {s.category} <span className="how">({s.inputs.join("; ")})</span>
                {s.notes?.length ? (
                  <span className="how" data-testid="scheme-notes">
                    {" "}
                    Note: {s.notes.join(" ")}
                  </span>
                ) : null}
              </li>
            ))}
          </ul>
        </>
      ) : null}

      <h2>{signed ? "Report text (signed)" : "Report text (draft)"}</h2>
      {signed ? (
        <section className="panel" data-testid="signed-text">
          {model.sections.map((s) => (
            <div key={s.id}>
              <h3>{s.title}</h3>
              {s.paragraphs.map((p, k) => (
                <p key={k}>{p}</p>
              ))}
            </div>
          ))}
        </section>
      ) : null}
      <DraftWorkspace
        key={report.id}
        testId={testId}
        reportId={report.id}
        version={report.version}
        revision={report.revision}
        signed={signed}
        amends={amends}
        {...(access.mode === "account"
          ? {
              signAs: {
                username: access.account.username,
                displayName: access.account.displayName,
                role: access.account.role,
              },
            }
          : {})}
        sections={model.sections.map((s) => ({
          id: s.id,
          title: s.title,
          text: s.paragraphs.join("\n\n"),
          ...(s.recheck ? { recheck: s.recheck } : {}),
        }))}
      />
      {signed ? (
        <>
          <h2>Signature</h2>
          <p data-testid="signature">
            Signed by {model.signedBy} on {when(model.signedAt)}. <span className="how">{report.attestation}</span>
          </p>
          <p className="how" data-testid="signer-identity">
            {signerIdentityNote(report.signerAccount)}
          </p>
        </>
      ) : null}

      <h2>Data quality</h2>
      <IssueList issues={model.issues} />

      <h2>Methods</h2>
      <ul>
        {model.methods.map((m) => (
          <li key={m}>{m}</li>
        ))}
      </ul>
      <h2>Sources</h2>
      <p className="how" data-testid="evidence-legend">
        {EVIDENCE_LEGEND}
      </p>
      <ol data-testid="report-sources">
        {model.sources.map((s) => (
          <li key={s.id}>
            {s.citation} <span className="tag">evidence: {EVIDENCE_LABEL[s.status]}</span>
          </li>
        ))}
      </ol>

      <h2>Report versions</h2>
      <ul data-testid="report-versions">
        {versions.map((v, i) => (
          <li key={v.id}>
            Version {v.version}: {v.status === "signed" ? `signed by ${v.signedBy} on ${when(v.signedAt)}` : "draft"}
            {versionStanding(v, i, versions)} · <a href={`/api/tests/${testId}/report/pdf?report=${v.id}`}>PDF</a>
          </li>
        ))}
      </ul>
    </>
  );
}

/**
 * What an amendment changes: the signer's reason (once signed) and the reported values that differ from the signed
 * version it replaces (for a draft: what signing it would change).
 */
function AmendmentPanel({ model }: { model: ReportModel }) {
  const words = amendmentWords(model);
  if (!words) return null;
  return (
    <section className="panel" data-testid="amendment-panel" aria-label="Amendment">
      <p style={{ margin: 0 }}>
        <strong>{words.heading}</strong>
        {words.reason ? <span data-testid="amendment-reason-shown"> {words.reason}</span> : null}
      </p>
      {words.changesIntro && words.lines.length ? (
        <>
          <p style={{ margin: "0.4rem 0 0" }}>{words.changesIntro}</p>
          <ul data-testid="amendment-changes" style={{ margin: "0.2rem 0 0" }}>
            {words.lines.map((l) => (
              <li key={l}>{l}</li>
            ))}
          </ul>
        </>
      ) : words.changesIntro ? (
        <p style={{ margin: "0.4rem 0 0" }} data-testid="amendment-changes">
          {words.changesIntro}
        </p>
      ) : null}
    </section>
  );
}

/** Where a version stands in the list (newest first): the current one, amended by a newer signed one, or superseded. */
function versionStanding(
  v: { id: number; status: string },
  index: number,
  versions: readonly { id: number; version: number; status: string }[],
) {
  if (index === 0) return " (current)";
  const newerSigned = versions.slice(0, index).findLast((x) => x.status === "signed");
  if (v.status === "signed")
    return newerSigned ? ` (amended by version ${newerSigned.version})` : " (stands; a newer draft is not signed yet)";
  return " (superseded draft: do not use)";
}
