import { DEFAULT_LAB_SETTINGS, EQUATIONS } from "@/lib/predicted";

export const dynamic = "force-static";

const STATUS_WORDS: Record<string, string> = {
  confirmed: "confirmed in the primary text",
  secondary: "seen in a secondary reproduction",
  recalled: "recalled — verify before relying on it",
};

/** The reference equations the engine can evaluate, each with its population, source and check values. */
export default function EquationsPage() {
  const defaults = new Set(Object.values(DEFAULT_LAB_SETTINGS.equations).flatMap((byErg) => Object.values(byErg ?? {})));
  return (
    <>
      <h1>Reference equations</h1>
      <p className="how">
        Every predicted value in cpet-desk names one of these equations. Each is a data file in <code>reference-equations/</code>{" "}
        with its citation, evidence status, derivation population and check values that the test suite reproduces. Equations
        marked “lab default” are used unless the lab chooses otherwise.
      </p>
      <table data-testid="equation-list">
        <thead>
          <tr>
            <th>Id</th>
            <th>What it predicts</th>
            <th>Population</th>
            <th>Source</th>
            <th>Evidence</th>
            <th>Checks</th>
          </tr>
        </thead>
        <tbody>
          {EQUATIONS.map((e) => (
            <tr key={e.id}>
              <td>
                <code>{e.id}</code> {defaults.has(e.id) ? <span className="tag">lab default</span> : null}
                {e.kind === "performance-estimate" ? <span className="tag">not a predicted normal</span> : null}
              </td>
              <td>
                {e.label}
                <div className="how">
                  {e.quantity} ({e.unit}), {e.ergometer}
                </div>
              </td>
              <td className="how">{e.population.cohort}</td>
              <td className="how">
                {e.source.authors} ({e.source.year}). {e.source.title}. {e.source.journal}
                {e.source.volume ? ` ${e.source.volume}` : ""}
                {e.source.pages ? `:${e.source.pages}` : ""}.
              </td>
              <td>{STATUS_WORDS[e.status] ?? e.status}</td>
              <td className="num">{e.checkValues.length}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </>
  );
}
