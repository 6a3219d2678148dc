import type { Measured } from "@/lib/core";
import { EVIDENCE_WORDS, sourceById } from "@/lib/report";
import { formatClock } from "@/lib/units";

/** "How was this found?": method, data window, averaging, inputs and sources with evidence status. */
export function HowFound({ m, extraSourceIds = [] }: { m: Measured; extraSourceIds?: string[] }) {
  const p = m.provenance;
  const ids = [...new Set([...p.sourceIds, ...extraSourceIds])];
  return (
    <details className="how">
      <summary>how was this found?</summary>
      <div>
        Method: {p.label}
        {p.window ? ` · data ${formatClock(p.window.startS)}–${formatClock(p.window.endS)}` : ""}
        {p.averaging ? ` · ${p.averaging}` : ""}
      </div>
      {m.value === null && m.reason ? <div>Not determinable: {m.reason}</div> : null}
      {p.inputs && Object.keys(p.inputs).length > 0 ? (
        <div>
          Inputs:{" "}
          {Object.entries(p.inputs)
            .map(([k, v]) => `${k} = ${typeof v === "number" ? +v.toFixed(3) : String(v)}`)
            .join("; ")}
        </div>
      ) : null}
      <SourceList ids={ids} />
    </details>
  );
}

export function SourceList({ ids }: { ids: string[] }) {
  if (ids.length === 0) return null;
  return (
    <ul style={{ margin: "0.2rem 0", paddingLeft: "1.1rem" }}>
      {ids.map((id) => {
        const s = sourceById(id);
        return (
          <li key={id}>
            {s ? s.citation : id} <span className="tag">{s ? EVIDENCE_WORDS[s.status] : "unregistered source"}</span>
          </li>
        );
      })}
    </ul>
  );
}

export function fmt(m: Measured | null | undefined, decimals = 0): string {
  if (!m || m.value === null || !Number.isFinite(m.value)) return "—";
  return m.value.toFixed(decimals);
}
