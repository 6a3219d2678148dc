import Link from "next/link";
import { notFound } from "next/navigation";
import { analyse } from "@/lib/analysis";
import { formatNumber, formatClock } from "@/lib/units";
import { getTest } from "@/lib/store/tests";
import { IssueList } from "../../components/IssueList";

export const dynamic = "force-dynamic";

export default async function TestPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const testId = Number(id);
  if (!Number.isInteger(testId)) notFound();
  const test = getTest(testId);
  if (!test) notFound();

  if (!test.record) {
    return (
      <>
        <h1>{test.label}</h1>
        <section className="panel" data-testid="refused">
          <h2 style={{ marginTop: 0 }}>This file could not be used</h2>
          <p>The original file is kept exactly as uploaded ({test.fileName}). What to fix:</p>
          <IssueList issues={test.importIssues} />
          {test.uploadId ? <a href={`/api/uploads/${test.uploadId}`}>Download the original file</a> : null}
        </section>
      </>
    );
  }

  const result = analyse(test.record);
  const peak = result.peak.vo2MlMin;
  return (
    <>
      <h1>{test.label}</h1>
      <p className="how">
        File {test.fileName} · {test.record.table.rows.length} rows (
        {test.record.table.shape === "breath" ? "breath by breath" : "stage data"}) · engine {result.engineVersion}
      </p>
      <div className="grid3">
        <section className="panel">
          <h3>Peak VO2</h3>
          <div className="keyfig" data-testid="peak-vo2">
            {formatNumber(peak.value, 0)} <small>mL/min</small>
          </div>
          <div className="keyfig" style={{ fontSize: "1.2rem" }} data-testid="peak-vo2-kg">
            {formatNumber(result.peak.vo2MlKgMin.value, 1)} <small>mL/kg/min</small>
          </div>
          <p className="how" data-testid="peak-method">
            {peak.value !== null ? `Method: ${peak.provenance.label}` : `Not determinable: ${peak.reason}`}
            {peak.provenance.window
              ? `, ${formatClock(peak.provenance.window.startS)}–${formatClock(peak.provenance.window.endS)}`
              : ""}
          </p>
        </section>
        <section className="panel">
          <h3>Test duration</h3>
          <div className="keyfig" data-testid="duration">
            {result.durationS.value !== null ? formatClock(result.durationS.value) : "—"} <small>min:s</small>
          </div>
          <p className="how">{result.durationS.provenance.label}</p>
        </section>
        <section className="panel">
          <h3>Data quality</h3>
          <IssueList issues={result.issues} />
        </section>
      </div>
      <section>
        <h2>How the file was read</h2>
        <table data-testid="column-decisions">
          <thead>
            <tr>
              <th>Column in file</th>
              <th>Read as</th>
              <th>Why</th>
            </tr>
          </thead>
          <tbody>
            {test.importColumns.map((c) => (
              <tr key={c.index}>
                <td>{c.header}</td>
                <td>
                  {c.field ?? "ignored"}
                  {c.unit ? ` (${c.unit})` : ""}
                </td>
                <td className="how">{c.reason}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </section>
      <p>
        <Link href="/">Back to the register</Link>
      </p>
    </>
  );
}
