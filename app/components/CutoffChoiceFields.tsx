/** One select per disputed cut-off (lab settings and per-test settings share it). */
export interface CutoffChoiceView {
  id: string;
  label: string;
  description: string;
  defaultOptionId: string;
  options: { id: string; label: string }[];
}

export function CutoffChoiceFields({
  choices,
  selected,
}: {
  choices: CutoffChoiceView[];
  selected: (choiceId: string) => string | undefined;
}) {
  return (
    <>
      {choices.map((c) => (
        <label key={c.id}>
          {c.label}
          <select name={`choice:${c.id}`} defaultValue={selected(c.id) ?? c.defaultOptionId}>
            {c.options.map((o) => (
              <option key={o.id} value={o.id}>
                {o.label}
                {o.id === c.defaultOptionId ? " (default)" : ""}
              </option>
            ))}
          </select>
          <span className="how">{c.description}</span>
        </label>
      ))}
    </>
  );
}

/** Validation errors and the confirmation of a form action. */
export function FormMessages({ errors, ok }: { errors?: Record<string, string>; ok?: string }) {
  return (
    <>
      {Object.entries(errors ?? {}).map(([k, msg]) => (
        <span key={k} className="sev-error" role="alert">
          {msg}
        </span>
      ))}
      {ok ? (
        <span className="sev-info" role="status">
          {ok}
        </span>
      ) : null}
    </>
  );
}
