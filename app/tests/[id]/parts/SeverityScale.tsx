/**
 * Our own neutral visual for an ordinal category: a row of small steps, filled up to the
 * category's severity (0 = best). Deliberately monochrome; the label carries the meaning.
 */
export function SeverityScale({ severity, steps }: { severity: number; steps: number }) {
  const n = Math.max(steps, severity + 1, 2);
  return (
    <span aria-label={`step ${severity + 1} of ${n}`} style={{ display: "inline-flex", gap: 2, verticalAlign: "middle" }}>
      {Array.from({ length: n }, (_, i) => (
        <span
          key={i}
          style={{
            width: 14,
            height: 8,
            border: "1px solid #5d6470",
            background: i <= severity ? "#5d6470" : "transparent",
            borderRadius: 1,
          }}
        />
      ))}
    </span>
  );
}
