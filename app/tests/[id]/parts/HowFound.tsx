import type { Measured } from "@/lib/core";
import { EVIDENCE_WORDS, sourceById } from "@/lib/report";
import { formatClock } from "@/lib/units";
import { inputText, provenanceLabelText } from "./provenanceWords";

/**
 * "How was this found?": method, data window, averaging, inputs and sources with evidence status, in plain
 * words. Inputs are named and rounded with their units; an input that cannot be named is left out (never
 * shown as a code name). `methodLabels` (threshold method id → label) names the methods of a consensus.
 */
export function HowFound({
  m,
  extraSourceIds = [],
  methodLabels,
}: {
  m: Measured;
  extraSourceIds?: string[];
  methodLabels?: Record<string, string>;
}) {
  const p = m.provenance;
  const ids = [...new Set([...p.sourceIds, ...extraSourceIds])];
  const inputs = Object.entries(p.inputs ?? {})
    .map(([k, v]) => inputText(k, v, methodLabels))
    .filter((x): x is string => x !== null);
  return (
    <details className="how">
      <summary>how was this found?</summary>
      <div>
        Method: {provenanceLabelText(p.label)}
        {p.window ? ` · data ${formatClock(p.window.startS)}–${formatClock(p.window.endS)}` : ""}
        {p.averaging ? ` · ${p.averaging}` : ""}
      </div>
      {m.value === null && m.reason ? <div>Not determinable: {m.reason}</div> : null}
      {inputs.length > 0 ? <div data-testid="how-inputs">Inputs: {inputs.join("; ")}</div> : null}
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
