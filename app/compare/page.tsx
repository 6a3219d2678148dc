import Link from "next/link";
import { z } from "zod";
import { analyse } from "@/lib/analysis";
import type { Patient } from "@/lib/core";
import {
  compareTests,
  INTERPRETATION_DATA,
  lowerFirst,
  variableInfo,
  type ReferralQuestion,
  type SerialItem,
} from "@/lib/interpret";
import { getLabDefaults } from "@/lib/store/labSettings";
import { effectiveSettings, getTest, listTests } from "@/lib/store/tests";
import { formatNumber, formatUtcMinute } from "@/lib/units";
import { TableScroll } from "../components/TableScroll";
import { SourceList } from "../tests/[id]/parts/HowFound";
import { samePatientCheck } from "./samePatientCheck";
import { recordId } from "../schemas";
import { pageAccess } from "../access";

export const dynamic = "force-dynamic";

const querySchema = z.object({
  before: recordId("test").optional(),
  after: recordId("test").optional(),
  population: z.string().optional(),
  samePatient: z.literal("confirmed").optional(),
});

/**
 * The noise-band population taken when the user has not chosen one: only where both tests' referral
 * names it (heart-failure referral → heart-failure test–retest data). Otherwise the user chooses; the
 * page never judges a change against another population's noise without saying so.
 */
const POPULATION_FOR_REFERRAL: Partial<Record<ReferralQuestion, string>> = { "heart-failure": "heart-failure" };

function TestSelect({
  name,
  label,
  tests,
  value,
}: {
  name: string;
  label: string;
  tests: { id: number; label: string; createdAt?: string }[];
  value?: number;
}) {
  return (
    <label>
      {label}
      <select name={name} defaultValue={value ?? ""}>
        <option value="">choose…</option>
        {tests.map((t) => (
          <option key={t.id} value={t.id}>
            {/* serial tests of one patient often share a label: the number and when each was added tell them apart */}
            {t.label} (test {t.id}
            {t.createdAt ? `, added ${formatUtcMinute(t.createdAt)}` : ""})
          </option>
        ))}
      </select>
    </label>
  );
}

function patientWords(p: Patient): string {
  return [
    p.sex ?? "sex not given",
    p.ageY !== undefined ? `${p.ageY} y` : "age not given",
    p.heightCm !== undefined ? `${p.heightCm} cm` : "height not given",
    p.weightKg !== undefined ? `${p.weightKg} kg` : "weight not given",
  ].join(", ");
}

/** A variable's value with the same decimals as everywhere else (the interpretation layer's variable table). */
function shown(variable: string, v: number | null): string {
  return formatNumber(v, variableInfo(variable).decimals ?? 0);
}

const VERDICT_WORDS: Record<SerialItem["verdict"], string> = {
  "beyond-noise": "beyond measurement noise",
  "within-noise": "within measurement noise",
  "not-judged": "not judged",
};

/** Two tests of one patient side by side; each change judged against published test–retest variability. */
export default async function ComparePage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  await pageAccess("/compare");
  const parsed = querySchema.safeParse(await searchParams);
  const q = parsed.success ? parsed.data : {};
  const tests = listTests().filter((t) => t.status === "imported");
  const populations = INTERPRETATION_DATA.variability.populations;
  const labDefaults = getLabDefaults();
  // One test chosen as both earlier and later compares nothing: refused with a message, never shown as "no change".
  const sameTest = q.before !== undefined && q.before === q.after;
  const a = q.before && !sameTest ? getTest(q.before) : null;
  const b = q.after && !sameTest ? getTest(q.after) : null;
  const ra = a?.record ?? null;
  const rb = b?.record ?? null;
  const referralDefault =
    ra && rb && ra.referral === rb.referral ? (POPULATION_FOR_REFERRAL[ra.referral] ?? undefined) : undefined;
  const chosen = q.population && populations.some((p) => p.id === q.population) ? q.population : undefined;
  const population = chosen ?? referralDefault;
  const populationLabel = populations.find((p) => p.id === population)?.label;
  const check = ra && rb ? samePatientCheck(ra.patient, rb.patient) : null;
  const mismatch = (check?.differences.length ?? 0) > 0;
  const confirmed = q.samePatient === "confirmed";
  // Verdicts are shown only for a chosen population and for tests that look like one patient (or that the
  // user has confirmed are one patient despite a differing detail).
  const judge = Boolean(population) && (!mismatch || confirmed);
  const comparison =
    ra && rb && a && b
      ? compareTests(
          analyse(ra, effectiveSettings(a.id, labDefaults)).interpretInput,
          analyse(rb, effectiveSettings(b.id, labDefaults)).interpretInput,
          population ?? "",
        )
      : null;
  const issues = (comparison?.issues ?? []).filter((i) => population || i.code !== "unknown-variability-population");
  const notJudgedWhy = !population
    ? "not judged: choose the population for the noise bands"
    : "not judged: the tests may be of different patients";

  return (
    <>
      <h1>Compare two tests</h1>
      <p className="how">
        For serial tests of one patient (for example before and after training or prehabilitation). A change is called beyond
        measurement noise only when it exceeds the published test–retest variability for that variable in the chosen population.
      </p>
      <form className="row" method="get" data-testid="compare-form">
        <TestSelect name="before" label="Earlier test" tests={tests} value={q.before} />
        <TestSelect name="after" label="Later test" tests={tests} value={q.after} />
        <label>
          Population for the noise bands
          <select name="population" defaultValue={population ?? ""}>
            {population ? null : <option value="">choose the population…</option>}
            {populations.map((p) => (
              <option key={p.id} value={p.id}>
                {p.label}
              </option>
            ))}
          </select>
        </label>
        {mismatch ? (
          <label style={{ display: "flex", gap: "0.4rem", alignItems: "center" }}>
            <input type="checkbox" name="samePatient" value="confirmed" defaultChecked={confirmed} />I have checked: both tests
            are of the same patient
          </label>
        ) : null}
        <button type="submit">Compare</button>
      </form>
      {comparison && ra && rb && check ? (
        <section data-testid="comparison">
          <p className="how" data-testid="compare-patients">
            Earlier test: {patientWords(ra.patient)} · later test: {patientWords(rb.patient)}
            {check.unchecked.length > 0 ? ` · not checked for sameness (missing in a test): ${check.unchecked.join(", ")}` : ""}
          </p>
          {mismatch ? (
            <div className="panel sev-error" role="alert" data-testid="patient-mismatch">
              <strong>These two tests may not be of the same patient.</strong>
              <ul style={{ margin: "0.3rem 0" }}>
                {check.differences.map((d) => (
                  <li key={d.field}>{d.text}</li>
                ))}
                {check.withinLimits.map((d) => (
                  <li key={d.field} data-testid="within-limit">
                    {d.text}
                  </li>
                ))}
              </ul>
              <p className="how" style={{ margin: "0 0 0.3rem" }}>
                The limits (age change between repeat tests, height difference) are our choice, not published cut-offs.
              </p>
              {confirmed ? (
                <p style={{ margin: 0 }}>
                  You confirmed both tests are of the same patient: changes are judged below. Correct the patient details of the
                  wrong test if one was entered in error.
                </p>
              ) : (
                <p style={{ margin: 0 }}>
                  Test–retest noise describes repeat tests of one person, so the changes below are not judged against measurement
                  noise. Choose two tests of one patient, or confirm above that they are the same patient.
                </p>
              )}
            </div>
          ) : check.withinLimits.length > 0 ? (
            <div className="panel sev-info" data-testid="patient-within-limits">
              Details that differ within the limits we chose for one patient tested twice:
              <ul style={{ margin: "0.3rem 0 0" }}>
                {check.withinLimits.map((d) => (
                  <li key={d.field} data-testid="within-limit">
                    {d.text}
                  </li>
                ))}
              </ul>
            </div>
          ) : null}
          <p>
            Effort: earlier test {lowerFirst(comparison.effort.beforeLabel)}; later test{" "}
            {lowerFirst(comparison.effort.afterLabel)}
            {comparison.effort.comparable ? "" : " — peak values are not judged because the tests are not both maximal"}.
          </p>
          <p data-testid="compare-population">
            Noise bands:{" "}
            {populationLabel ? (
              <>
                <strong>{populationLabel}</strong>
                {chosen ? "" : " (taken from both tests' referral; choose another above)"}
              </>
            ) : (
              <strong>no population chosen — choose one above to judge the changes</strong>
            )}
          </p>
          <TableScroll label="Changes between the two tests">
            <table className="wide">
              <thead>
                <tr>
                  <th>Variable</th>
                  <th className="num">Earlier</th>
                  <th className="num">Later</th>
                  <th className="num">Change</th>
                  <th>Verdict</th>
                  <th>Noise band used</th>
                </tr>
              </thead>
              <tbody>
                {comparison.items.map((it) => (
                  <tr key={it.variable} data-testid={`compare-${it.variable}`}>
                    <td>
                      {it.label} {it.unit ? <span className="how">({it.unit})</span> : null}
                    </td>
                    <td className="num">{shown(it.variable, it.before)}</td>
                    <td className="num">{shown(it.variable, it.after)}</td>
                    <td className="num">
                      {it.change !== null
                        ? `${it.change > 0 ? "+" : ""}${shown(it.variable, it.change)}${it.unit.startsWith("%") ? " points" : ""}`
                        : "—"}
                      {it.changePct !== null ? (
                        <div className="how">{`${it.changePct > 0 ? "+" : ""}${it.changePct.toFixed(0)} %`}</div>
                      ) : null}
                    </td>
                    <td data-testid="verdict">
                      {judge ? (
                        <>
                          {VERDICT_WORDS[it.verdict]}
                          {it.noise ? <div className="how">population: {it.noise.population}</div> : null}
                        </>
                      ) : it.change !== null ? (
                        notJudgedWhy
                      ) : (
                        "not judged"
                      )}
                    </td>
                    <td className="how">
                      {judge || it.change === null ? it.text : "—"}
                      {judge && it.noise ? <SourceList ids={it.noise.sourceIds} /> : null}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </TableScroll>
          {issues.length > 0 ? (
            <ul className="how">
              {issues.map((i, k) => (
                <li key={k}>{i.message}</li>
              ))}
            </ul>
          ) : null}
        </section>
      ) : sameTest ? (
        <p className="panel sev-error" role="alert" data-testid="same-test">
          The same test is chosen as both the earlier and the later test. A comparison needs two different tests of one patient:
          choose another test for one of them.
        </p>
      ) : (
        <p className="how">Choose two imported tests to compare.</p>
      )}
      <p>
        <Link href="/">Back to the register</Link>
      </p>
    </>
  );
}
