import Link from "next/link";
import { z } from "zod";
import { analyse } from "@/lib/analysis";
import { compareTests, INTERPRETATION_DATA } from "@/lib/interpret";
import { getLabDefaults } from "@/lib/store/labSettings";
import { effectiveSettings, getTest, listTests } from "@/lib/store/tests";
import { SourceList } from "../tests/[id]/parts/HowFound";

export const dynamic = "force-dynamic";

const querySchema = z.object({
  before: z.coerce.number().int().positive().optional(),
  after: z.coerce.number().int().positive().optional(),
  population: z.string().optional(),
});

function TestSelect({
  name,
  label,
  tests,
  value,
}: {
  name: string;
  label: string;
  tests: { id: number; label: string }[];
  value?: number;
}) {
  return (
    <label>
      {label}
      <select name={name} defaultValue={value ?? ""}>
        <option value="">choose…</option>
        {tests.map((t) => (
          <option key={t.id} value={t.id}>
            {t.label}
          </option>
        ))}
      </select>
    </label>
  );
}

/** Two tests of one patient side by side; each change judged against published test–retest variability. */
export default async function ComparePage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const parsed = querySchema.safeParse(await searchParams);
  const q = parsed.success ? parsed.data : {};
  const tests = listTests().filter((t) => t.status === "imported");
  const populations = INTERPRETATION_DATA.variability.populations;
  const population = q.population && populations.some((p) => p.id === q.population) ? q.population : populations[0]?.id;
  const labDefaults = getLabDefaults();
  const a = q.before ? getTest(q.before) : null;
  const b = q.after ? getTest(q.after) : null;
  const comparison =
    a?.record && b?.record && population
      ? compareTests(
          analyse(a.record, effectiveSettings(a.id, labDefaults)).interpretInput,
          analyse(b.record, effectiveSettings(b.id, labDefaults)).interpretInput,
          population,
        )
      : null;
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
          <select name="population" defaultValue={population}>
            {populations.map((p) => (
              <option key={p.id} value={p.id}>
                {p.label}
              </option>
            ))}
          </select>
        </label>
        <button type="submit">Compare</button>
      </form>
      {comparison ? (
        <section data-testid="comparison">
          <p>
            Effort: earlier {comparison.effort.before}, later {comparison.effort.after}
            {comparison.effort.comparable ? "" : " — peak values are not judged because the tests are not both maximal"}.
          </p>
          <table>
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
                <tr key={it.variable}>
                  <td>
                    {it.label} {it.unit ? <span className="how">({it.unit})</span> : null}
                  </td>
                  <td className="num">{it.before?.toFixed(1) ?? "—"}</td>
                  <td className="num">{it.after?.toFixed(1) ?? "—"}</td>
                  <td className="num">
                    {it.change !== null ? `${it.change > 0 ? "+" : ""}${it.change.toFixed(1)}` : "—"}
                    {it.changePct !== null ? <div className="how">{it.changePct.toFixed(0)} %</div> : null}
                  </td>
                  <td>
                    {it.verdict === "beyond-noise"
                      ? "beyond measurement noise"
                      : it.verdict === "within-noise"
                        ? "within measurement noise"
                        : "not judged"}
                  </td>
                  <td className="how">
                    {it.text}
                    {it.noise ? <SourceList ids={it.noise.sourceIds} /> : null}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
          {comparison.issues.length > 0 ? (
            <ul className="how">
              {comparison.issues.map((i, k) => (
                <li key={k}>{i.message}</li>
              ))}
            </ul>
          ) : null}
        </section>
      ) : (
        <p className="how">Choose two imported tests to compare.</p>
      )}
      <p>
        <Link href="/">Back to the register</Link>
      </p>
    </>
  );
}
