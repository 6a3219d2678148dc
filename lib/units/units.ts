/**
 * Canonical units inside the engine. Names carry units (`vo2MlMin`, `veLMin`, `workW`,
 * `petco2MmHg`); conversion happens only at import and at display.
 */
export const CANONICAL_UNIT = {
  time: "s",
  vo2: "mL/min",
  vco2: "mL/min",
  ve: "L/min",
  hr: "1/min",
  work: "W",
  speed: "km/h",
  grade: "%",
  rr: "1/min",
  vt: "L",
  peto2: "mmHg",
  petco2: "mmHg",
  spo2: "%",
  lactate: "mmol/L",
} as const;

export type QuantityId = keyof typeof CANONICAL_UNIT;

/** Linear conversion factors to the canonical unit (value_canonical = value * factor + offset). */
interface Conversion {
  factor: number;
  offset?: number;
}

/**
 * Known unit spellings per quantity. Factors are exact definitions (common practice):
 * 1 L = 1000 mL; 1 kPa = 7.50062 mmHg (1 mmHg = 133.322 Pa, standard definition);
 * 1 kp·m/min = 9.80665 J/min = 0.16344 W (kpm/min ÷ 6.12 is the customary rounding, common practice).
 */
export const UNIT_CONVERSIONS: Record<QuantityId, Record<string, Conversion>> = {
  time: { s: { factor: 1 }, min: { factor: 60 }, ms: { factor: 0.001 }, h: { factor: 3600 } },
  vo2: { "mL/min": { factor: 1 }, "L/min": { factor: 1000 } },
  vco2: { "mL/min": { factor: 1 }, "L/min": { factor: 1000 } },
  ve: { "L/min": { factor: 1 }, "mL/min": { factor: 0.001 } },
  hr: { "1/min": { factor: 1 } },
  work: { W: { factor: 1 }, "kpm/min": { factor: 1 / 6.12 } },
  speed: { "km/h": { factor: 1 }, "m/s": { factor: 3.6 }, mph: { factor: 1.609344 } },
  grade: { "%": { factor: 1 } },
  rr: { "1/min": { factor: 1 } },
  vt: { L: { factor: 1 }, mL: { factor: 0.001 } },
  peto2: { mmHg: { factor: 1 }, kPa: { factor: 7.50062 } },
  petco2: { mmHg: { factor: 1 }, kPa: { factor: 7.50062 } },
  spo2: { "%": { factor: 1 }, fraction: { factor: 100 } },
  lactate: { "mmol/L": { factor: 1 }, "mg/dL": { factor: 1 / 9.008 } },
};

/** Convert a value given in `unit` to the canonical unit of `quantity`. Unknown unit: programming mistake. */
export function toCanonical(quantity: QuantityId, value: number, unit: string): number {
  const c = UNIT_CONVERSIONS[quantity][unit];
  if (!c) throw new Error(`unknown unit ${unit} for ${quantity}`);
  return value * c.factor + (c.offset ?? 0);
}

/** Convert a canonical value to `unit` for display. */
export function fromCanonical(quantity: QuantityId, value: number, unit: string): number {
  const c = UNIT_CONVERSIONS[quantity][unit];
  if (!c) throw new Error(`unknown unit ${unit} for ${quantity}`);
  return (value - (c.offset ?? 0)) / c.factor;
}

/** mL/min per kg of body mass. */
export function perKg(valueMlMin: number, weightKg: number): number {
  return valueMlMin / weightKg;
}

/** 1 kg = 2.20462 lb; 1 in = 2.54 cm (exact definitions, common practice). */
export const LB_PER_KG = 2.20462;
export const CM_PER_INCH = 2.54;
