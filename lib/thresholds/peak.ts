import type { BreathRow, NumericField } from "../breath";
import { measured, notDetermined, type Measured } from "../core";
import { rollingTimeAverage } from "../signal";

export interface PeakOptions {
  /** Averaging window, seconds. @default 30 */
  windowS?: number;
  /** Unit of the field, for display. */
  unit: string;
}

/**
 * Peak of a field as its highest rolling time-window average (default 30 s).
 * Method: highest 30-s average (common practice; source `peak-rolling-average`).
 * Returns "not determinable" when no full window exists.
 */
export function peakOverWindow(rows: readonly BreathRow[], field: NumericField, options: PeakOptions): Measured {
  const windowS = options.windowS ?? 30;
  const provenance = {
    method: `peak-rolling-${windowS}s`,
    label: `highest ${windowS}-s rolling average`,
    sourceIds: ["peak-rolling-average"],
    averaging: `${windowS}-s rolling time window`,
  };
  const windows = rollingTimeAverage(rows, field, windowS);
  if (windows.length === 0) return notDetermined(options.unit, provenance, `no ${windowS}-s window of ${field} data`);
  let best = windows[0];
  for (const w of windows) if (w.mean > best.mean) best = w;
  return measured(best.mean, options.unit, {
    ...provenance,
    window: { startS: best.startS, endS: best.endS },
    inputs: { breaths: best.count },
  });
}
