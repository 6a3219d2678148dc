import { INTERPRETATION_DATA, type InterpretationData } from "./interpretationData";
import { resolveChoices } from "./resolveChoices";
import type { InterpretSettings } from "./types";

/** The lab's limit below which peak VO2 (% predicted) reads as reduced: the option chosen for "peak-vo2-normal". */
export interface PeakVo2ReducedLimit {
  /** Reduced when % predicted `op` `pct`. */
  op: "<" | "<=";
  pct: number;
  /** The option's label, e.g. "Reduced if < 85 % predicted". */
  label: string;
}

/**
 * The limit the interpretation's rule `peak-vo2-reduced` uses, read from the lab's choice (choices.json, each option with
 * its source and status), so that other statements about "reduced peak VO2" (the weight-basis note) use the same one.
 * Null when the chosen option is not a plain % predicted comparison (none is today).
 */
export function peakVo2ReducedLimit(
  settings: InterpretSettings = {},
  data: InterpretationData = INTERPRETATION_DATA,
): PeakVo2ReducedLimit | null {
  const opt = resolveChoices(data, settings).options["peak-vo2-normal"];
  const c = opt?.condition as { var?: unknown; op?: unknown; value?: unknown } | undefined;
  if (!c || c.var !== "peakVo2PctPred" || (c.op !== "<" && c.op !== "<=") || typeof c.value !== "number") return null;
  return { op: c.op, pct: c.value, label: opt.label };
}
