import Link from "next/link";
import { ensureDemoData } from "@/lib/store/seedDemo";
import { listTests } from "@/lib/store/tests";
import { reportStandings, standingWords } from "@/lib/store/reports";
import { TableScroll } from "./components/TableScroll";
import { UploadForm } from "./components/UploadForm";
import { pageAccess } from "./access";

export const dynamic = "force-dynamic";

export default async function RegisterPage() {
  await pageAccess("/");
  await ensureDemoData();
  const tests = listTests();
  const standings = reportStandings();
  return (
    <>
      <h1>Test register</h1>
      <section className="panel">
        <h2 style={{ marginTop: 0 }}>Import a test</h2>
        <p className="how">
          Breath-by-breath or stage data. Files whose header names carry their unit (
          <code>time_s, vo2_ml_min, vco2_ml_min, ve_l_min, hr_bpm, work_w, …</code>) import without any mapping; other layouts are
          recognised column by column and every decision is shown. The original file is always kept exactly as uploaded.
        </p>
        <UploadForm />
      </section>
      <section>
        <h2>Tests</h2>
        <TableScroll label="Tests">
          <table className="register" data-testid="test-list">
            <thead>
              <tr>
                <th>Label</th>
                <th>File</th>
                <th>State</th>
                <th>Report</th>
                <th>Imported</th>
              </tr>
            </thead>
            <tbody>
              {tests.map((t) => (
                <tr key={t.id}>
                  <td>
                    <Link href={`/tests/${t.id}`}>{t.label}</Link> {t.demo ? <span className="tag">invented demo</span> : null}
                  </td>
                  <td>{t.fileName ?? <span className="how">none kept</span>}</td>
                  <td>{t.status === "imported" ? "imported" : "refused — see why"}</td>
                  <td data-testid={`report-standing-${t.id}`}>
                    {standings.get(t.id)?.newest === "signed" && !standings.get(t.id)?.analysisChanged ? (
                      standingWords(standings.get(t.id))
                    ) : (
                      <span className={standings.get(t.id) ? "draft-word" : "how"}>{standingWords(standings.get(t.id))}</span>
                    )}
                  </td>
                  {/* a date and time never break across lines ("2026-12-02 10:15") */}
                  <td className="nowrap">{t.createdAt.slice(0, 16).replace("T", " ")}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </TableScroll>
      </section>
    </>
  );
}
