/**
 * A measured or derived value is never a bare number: it carries its unit and its story
 * (method, data window, sources, inputs). The UI's "how was this found?", the report's methods
 * section and the CLI all read this one structure.
 */
export interface Provenance {
  /** Method id, e.g. `peak-rolling-30s`, `v-slope-beaver-1986`. */
  method: string;
  /** Plain words for the method, as shown to a clinician. */
  label: string;
  /** Ids in a source registry (see `Source`). */
  sourceIds: string[];
  /** Data span used, in seconds from the start of the record. */
  window?: { startS: number; endS: number };
  /** Named inputs with their values, so a reader can redo the arithmetic. */
  inputs?: Record<string, number | string | boolean | null>;
  /** Averaging or conditioning applied to the data behind this number. */
  averaging?: string;
}

export interface Measured {
  /** `null` means "not determinable"; then `reason` says why. */
  value: number | null;
  unit: string;
  provenance: Provenance;
  reason?: string;
}

export function measured(value: number, unit: string, provenance: Provenance): Measured {
  if (!Number.isFinite(value)) {
    return { value: null, unit, provenance, reason: "the computation gave no finite value" };
  }
  return { value, unit, provenance };
}

export function notDetermined(unit: string, provenance: Provenance, reason: string): Measured {
  return { value: null, unit, provenance, reason };
}

/**
 * A missing value's reason without its "not determinable:" (or "not determined" / "not assessable") lead-in, for a
 * text that already says the value is missing; null when there is no reason.
 */
export function reasonWithoutLeadIn(reason: string | undefined): string | null {
  const r = (reason ?? "").replace(/^not (determinable|determined|assessable)\s*:?\s*/i, "").trim();
  return r === "" ? null : r;
}
