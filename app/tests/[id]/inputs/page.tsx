import Link from "next/link";
import { notFound } from "next/navigation";
import { getTest } from "@/lib/store/tests";
import { recordToken } from "../recordToken";
import { formatClock } from "@/lib/units";
import styles from "../columns/columns.module.css";
import { BloodGasForm, ConductForm, ContextForm, LactateForm, SpirometryForm } from "./InputForms";
import { pageAccess } from "../../../access";
import { auditTestViewed } from "@/lib/store/reports";

export const dynamic = "force-dynamic";

export default async function InputsPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const access = await pageAccess(`/tests/${id}/inputs`);
  const testId = Number(id);
  if (!Number.isInteger(testId) || testId <= 0) notFound();
  const test = getTest(testId);
  if (!test) notFound();
  auditTestViewed(access.actor, testId, "inputs");
  const record = test.record;
  const token = recordToken(test);
  if (!record) {
    return (
      <>
        <h1>Extra inputs — {test.label}</h1>
        <p className="sev-warning" style={{ padding: "0.5rem" }} data-testid="inputs-refused">
          This test&apos;s file could not be used yet, so there is nothing to add lactate, gases or context to.{" "}
          <Link href={`/tests/${testId}/columns`}>Map its columns and read it again →</Link>
        </p>
      </>
    );
  }
  const lactate = record.lactate ?? [];
  const gases = record.bloodGases ?? [];
  return (
    <>
      <h1 data-testid="inputs-title">Lactate, blood gases, spirometry and context — {test.label}</h1>
      <p className="row">
        <Link href={`/tests/${testId}`} data-testid="back-to-analysis">
          ← back to the analysis
        </Link>
        <Link href={`/tests/${testId}/columns`}>How the file was read</Link>
      </p>
      <p className="how">
        Everything saved here is added to the test record; the analysis view recomputes from the record and its settings every
        time it is opened. Uploaded sample files are kept as they were sent.
      </p>

      <h2>Blood lactate</h2>
      {lactate.length > 0 ? (
        <table data-testid="lactate-stored" className={styles.compact}>
          <caption className="how" style={{ textAlign: "left" }}>
            {lactate.length} sample(s) saved with this test
          </caption>
          <thead>
            <tr>
              <th>Time</th>
              <th className="num">Stage</th>
              <th className="num">Work rate (W)</th>
              <th className="num">Speed (km/h)</th>
              <th className="num">Lactate (mmol/L)</th>
            </tr>
          </thead>
          <tbody>
            {lactate.map((s, i) => (
              <tr key={i}>
                <td>{s.timeS !== undefined ? formatClock(s.timeS) : "—"}</td>
                <td className="num">{s.stage ?? "—"}</td>
                <td className="num">{s.workW ?? "—"}</td>
                <td className="num">{s.speedKmh ?? "—"}</td>
                <td className="num">{s.lactateMmolL.toFixed(1)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      ) : (
        <p className="how">No lactate samples yet. A new file replaces the saved samples.</p>
      )}
      <LactateForm testId={testId} />

      <h2>Arterial blood gases</h2>
      {gases.length > 0 ? (
        <table data-testid="bloodgas-stored" className={styles.compact}>
          <thead>
            <tr>
              <th>Time</th>
              <th>Label</th>
              <th className="num">PaO2 (mmHg)</th>
              <th className="num">PaCO2 (mmHg)</th>
            </tr>
          </thead>
          <tbody>
            {gases.map((s, i) => (
              <tr key={i}>
                <td>
                  {typeof s.timeS === "number" && Number.isFinite(s.timeS) ? formatClock(s.timeS) : "— (placed by its label)"}
                </td>
                <td>{s.label ?? ""}</td>
                <td className="num">{s.paO2MmHg?.toFixed(1) ?? "—"}</td>
                <td className="num">{s.paCO2MmHg?.toFixed(1) ?? "—"}</td>
              </tr>
            ))}
          </tbody>
        </table>
      ) : (
        <p className="how">No blood gases yet. With PaCO2, the analysis gives the dead-space fraction VD/VT at each sample.</p>
      )}
      <BloodGasForm testId={testId} />

      <h2>Resting spirometry</h2>
      <p className="how">Leave a box empty if the value is not known. A measured MVV is used for the breathing reserve.</p>
      <SpirometryForm testId={testId} current={record.spirometry ?? {}} recordToken={token} />

      <h2>Clinical context and medication</h2>
      <ContextForm
        testId={testId}
        current={{
          ...(record.context ?? {}),
          betaBlocker: record.patient.betaBlocker,
          atrialFibrillation: record.patient.atrialFibrillation,
          haemoglobinGDl: record.patient.haemoglobinGDl,
        }}
        recordToken={token}
      />

      <h2>Test conduct</h2>
      <ConductForm testId={testId} current={record.conduct ?? {}} recordToken={token} />
    </>
  );
}
