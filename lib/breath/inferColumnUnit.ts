import { UNIT_CONVERSIONS, type QuantityId } from "../units";
import type { NumericField } from "./types";

/** Robust summary of a column's values (5th/50th/95th percentiles of the finite values). */
export interface ColumnStats {
  n: number;
  low: number;
  median: number;
  high: number;
}

export function columnStats(values: ArrayLike<number>): ColumnStats {
  const v: number[] = [];
  for (let i = 0; i < values.length; i++) if (Number.isFinite(values[i])) v.push(values[i]);
  if (v.length === 0) return { n: 0, low: NaN, median: NaN, high: NaN };
  v.sort((a, b) => a - b);
  const q = (p: number) => v[Math.min(v.length - 1, Math.max(0, Math.round(p * (v.length - 1))))];
  return { n: v.length, low: q(0.05), median: q(0.5), high: q(0.95) };
}

/** Quantity id in lib/units for each numeric field. */
export const QUANTITY_OF: Record<Exclude<NumericField, "stage">, QuantityId> = {
  timeS: "time",
  vo2MlMin: "vo2",
  vco2MlMin: "vco2",
  veLMin: "ve",
  hrBpm: "hr",
  workW: "work",
  speedKmh: "speed",
  gradePct: "grade",
  rrBrMin: "rr",
  vtL: "vt",
  peto2MmHg: "peto2",
  petco2MmHg: "petco2",
  spo2Pct: "spo2",
  lactateMmolL: "lactate",
};

/** Canonical unit key of each field (matches `CANONICAL_UNIT` in lib/units). */
export const CANONICAL_UNIT_OF: Record<NumericField, string> = {
  timeS: "s",
  vo2MlMin: "mL/min",
  vco2MlMin: "mL/min",
  veLMin: "L/min",
  hrBpm: "1/min",
  workW: "W",
  speedKmh: "km/h",
  gradePct: "%",
  rrBrMin: "1/min",
  vtL: "L",
  peto2MmHg: "mmHg",
  petco2MmHg: "mmHg",
  spo2Pct: "%",
  stage: "",
  lactateMmolL: "mmol/L",
};

/** What the values' size says, with the plain reason. `unit` is a unit key or a special marker. */
export interface MagnitudeGuess {
  unit: string;
  because: string;
}

const fmt = (x: number) => (Math.abs(x) >= 100 ? x.toFixed(0) : Math.abs(x) >= 10 ? x.toFixed(1) : x.toFixed(2));

/**
 * Unit suggested by the size of the values, from typical physiological ranges (common practice):
 * VO2 at rest-to-peak is ~0.2–6 L/min = 200–6000 mL/min, per kg ~3–90 mL/kg/min; VE 5–200 L/min;
 * tidal volume 0.3–4 L; PETCO2 ~3–7 kPa = 25–50 mmHg; PETO2 ~12–17 kPa = 90–130 mmHg; SpO2 as a
 * fraction ≤ 1; respiratory rate 5–70 /min versus R–R intervals 300–1500 ms.
 * Returns undefined when size alone cannot tell.
 */
export function guessUnitFromValues(field: NumericField, s: ColumnStats, genericLoadName: boolean): MagnitudeGuess | undefined {
  if (s.n === 0) return undefined;
  const range = `values ${fmt(s.low)}–${fmt(s.high)} (median ${fmt(s.median)})`;
  switch (field) {
    case "vo2MlMin":
      if (s.median < 10) return { unit: "L/min", because: `${range} look like L/min` };
      if (s.median < 100) return { unit: "per-kg", because: `${range} look like mL/kg/min` };
      return { unit: "mL/min", because: `${range} look like mL/min` };
    case "vco2MlMin":
      return s.median < 10
        ? { unit: "L/min", because: `${range} look like L/min` }
        : { unit: "mL/min", because: `${range} look like mL/min` };
    case "veLMin":
      return s.median > 400
        ? { unit: "mL/min", because: `${range} look like mL/min` }
        : { unit: "L/min", because: `${range} look like L/min` };
    case "vtL":
      return s.median > 20
        ? { unit: "mL", because: `${range} look like mL` }
        : { unit: "L", because: `${range} look like litres` };
    case "peto2MmHg":
      return s.median < 30
        ? { unit: "kPa", because: `${range} look like kPa` }
        : { unit: "mmHg", because: `${range} look like mmHg` };
    case "petco2MmHg":
      return s.median < 12
        ? { unit: "kPa", because: `${range} look like kPa` }
        : { unit: "mmHg", because: `${range} look like mmHg` };
    case "spo2Pct":
      return s.high <= 1.0001
        ? { unit: "fraction", because: `${range} look like a fraction of 1` }
        : { unit: "%", because: `${range} look like percent` };
    case "hrBpm":
      // heart rate is 25–240 beats/min; R–R intervals are 200–2400 ms (0.2–2.4 s): a median above 250 is a heart
      // period in ms, values all within 0.2–2.4 a heart period in seconds
      if (s.median > 250)
        return { unit: "ms", because: `${range} look like R–R intervals between heartbeats (ms), not beats per minute` };
      return rrInSeconds(s)
        ? { unit: "s", because: `${range} look like R–R intervals between heartbeats in seconds, not beats per minute` }
        : undefined;
    case "rrBrMin":
      if (s.median > 150)
        return { unit: "ms", because: `${range} look like R–R intervals between heartbeats (ms), not breaths per minute` };
      // below 3 breaths/min is not breathing during a test; 0.2–2.4 is a heart period in seconds
      return rrInSeconds(s)
        ? { unit: "s", because: `${range} look like R–R intervals between heartbeats in seconds, not breaths per minute` }
        : { unit: "1/min", because: `${range} look like breaths per minute` };
    case "workW":
      if (genericLoadName && s.high < 30 && s.low >= 3)
        return {
          unit: "km/h",
          because: `${range} are too low for a work rate in watts near peak exercise but fit treadmill speed in km/h`,
        };
      return undefined;
    default:
      return undefined;
  }
}

/** Every value within the plausible R–R interval read in seconds (0.2–2.4 s). */
function rrInSeconds(s: ColumnStats): boolean {
  return s.low >= PLAUSIBLE_RR_INTERVAL_MS[0] / 1000 && s.high <= PLAUSIBLE_RR_INTERVAL_MS[1] / 1000;
}

/**
 * Plausible physiological ranges in canonical units (common practice; generous on purpose). Used to
 * judge a unit (are the values plausible once converted?) and to set aside impossible values.
 */
export const PLAUSIBLE_RANGE: Partial<Record<NumericField, [number, number]>> = {
  vo2MlMin: [50, 8000],
  vco2MlMin: [30, 10000],
  veLMin: [1, 300],
  hrBpm: [25, 240],
  workW: [0, 2500],
  speedKmh: [0, 40],
  gradePct: [-10, 40],
  rrBrMin: [3, 90],
  vtL: [0.1, 6],
  peto2MmHg: [40, 150],
  petco2MmHg: [10, 80],
  spo2Pct: [50, 100],
  lactateMmolL: [0.1, 30],
};
/** Plausible VO2 per kg, mL/kg/min (common practice). */
export const PLAUSIBLE_VO2_PER_KG: [number, number] = [1, 100];
/** Plausible R–R interval between heartbeats, ms (25–300 beats/min; common practice). */
export const PLAUSIBLE_RR_INTERVAL_MS: [number, number] = [200, 2400];

/**
 * Whether the bulk of a column (its 5th–95th percentiles) is physiologically plausible when read in
 * `unit`. Fields without a range, or units that cannot be converted, count as plausible.
 */
export function plausibleIn(field: NumericField, unit: string, s: ColumnStats): boolean {
  if (s.n === 0) return true;
  let range: [number, number] | undefined;
  let factor = 1;
  if (field === "vo2MlMin" && unit === "per-kg") range = PLAUSIBLE_VO2_PER_KG;
  else if ((field === "rrBrMin" || field === "hrBpm") && unit === "ms") range = PLAUSIBLE_RR_INTERVAL_MS;
  else if ((field === "rrBrMin" || field === "hrBpm") && unit === "s") {
    range = PLAUSIBLE_RR_INTERVAL_MS;
    factor = 1000;
  } else if (field === "workW" && unit === "km/h") range = PLAUSIBLE_RANGE.speedKmh;
  else {
    range = PLAUSIBLE_RANGE[field];
    const f = factorToCanonical(field, unit);
    if (f === undefined) return true;
    factor = f;
  }
  if (!range) return true;
  return s.low * factor >= range[0] && s.high * factor <= range[1];
}

/** Multiply-by factor from `unit` to the field's canonical unit (undefined when the unit is not known). */
export function factorToCanonical(field: NumericField, unit: string): number | undefined {
  if (field === "stage") return 1;
  const q = QUANTITY_OF[field];
  const c = UNIT_CONVERSIONS[q][unit];
  return c ? c.factor : undefined;
}
