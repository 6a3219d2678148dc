import { DEFAULT_LAB_SETTINGS, EQUATIONS, PREDICTED_QUANTITIES, type LabQuantity, type PredictedQuantity } from "@/lib/predicted";
import { getLabDefaults } from "@/lib/store/labSettings";
import { TableScroll } from "../components/TableScroll";
import { pageAccess } from "../access";

// per request: the page asks who is signed in (app/access.ts)
export const dynamic = "force-dynamic";

const STATUS_WORDS: Record<string, string> = {
  confirmed: "confirmed in the primary text",
  secondary: "seen in a secondary reproduction",
  recalled: "recalled — verify before relying on it",
};

/** A predicted quantity in words with its unit: "lowest VE/VCO2 (no unit)", "maximal heart rate (bpm)". */
function quantityWords(quantity: PredictedQuantity): string {
  const q = PREDICTED_QUANTITIES[quantity];
  const unit = q.unit === "1" ? "no unit" : q.unit === "1/min" ? "bpm" : q.unit;
  return `${q.label} (${unit})`;
}

const ERGOMETER_WORDS: Record<string, string> = { both: "cycle or treadmill" };

/** The reference equations the engine can evaluate, each with its population, source and check values. */
export default async function EquationsPage() {
  await pageAccess("/equations");
  // this lab's defaults (the lab page may have changed the built-in ones), by equation: for which ergometers
  const lab = getLabDefaults().labSettings?.equations ?? {};
  const defaults = new Map<string, string[]>();
  for (const q of new Set([...Object.keys(DEFAULT_LAB_SETTINGS.equations), ...Object.keys(lab)]) as Set<LabQuantity>)
    for (const erg of ["cycle", "treadmill"] as const) {
      const id = lab[q]?.[erg] ?? DEFAULT_LAB_SETTINGS.equations[q]?.[erg];
      if (id) defaults.set(id, [...(defaults.get(id) ?? []), erg]);
    }
  return (
    <>
      <h1>Reference equations</h1>
      <p className="how">
        Every predicted value in cpet-desk names one of these equations. Each is a data file in <code>reference-equations/</code>{" "}
        with its citation, evidence status, derivation population and check values that the test suite reproduces. Equations
        marked “lab default” are the ones this lab's settings use, for the ergometer named; a test's own settings may choose
        another.
      </p>
      <TableScroll label="Reference equations">
        <table className="wide" data-testid="equation-list" style={{ minWidth: "60rem" }}>
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
                  <code>{e.id}</code>{" "}
                  {defaults.has(e.id) ? (
                    <span className="tag" data-testid={`lab-default-${e.id}`}>
                      lab default, {defaults.get(e.id)!.join(" and ")}
                    </span>
                  ) : null}
                  {e.kind === "performance-estimate" ? <span className="tag">not a predicted normal</span> : null}
                </td>
                <td>
                  {e.label}
                  <div className="how">
                    {quantityWords(e.quantity)}, {ERGOMETER_WORDS[e.ergometer] ?? e.ergometer}
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
      </TableScroll>
    </>
  );
}
