/**
 * Unit spellings, normalised (lower case, no spaces, "·x-1" → "/x"), mapped to the unit keys of
 * `UNIT_CONVERSIONS` in lib/units, or to special markers: "per-kg" (mL/kg/min), "clock" (m:ss),
 * "rr-interval-ms" (R–R interval). To add a spelling, add it to the right group.
 */
export const UNIT_SPELLINGS: Record<string, string> = {
  s: "s",
  sec: "s",
  secs: "s",
  second: "s",
  seconds: "s",
  min: "min",
  mins: "min",
  minute: "min",
  minutes: "min",
  m: "min",
  ms: "ms",
  msec: "ms",
  millisecond: "ms",
  milliseconds: "ms",
  h: "h",
  hour: "h",
  hours: "h",
  "hh:mm:ss": "clock",
  "h:mm:ss": "clock",
  "mm:ss": "clock",
  "m:ss": "clock",
  "min:s": "clock",
  "min:sec": "clock",
  "mm:ss.s": "clock",
  "hh:mm:ss.s": "clock",
  "ml/min": "mL/min",
  mlmin: "mL/min",
  "ml/m": "mL/min",
  "l/min": "L/min",
  lmin: "L/min",
  lpm: "L/min",
  "l/m": "L/min",
  "ml/kg/min": "per-kg",
  "ml/min/kg": "per-kg",
  mlkgmin: "per-kg",
  mlminkg: "per-kg",
  "/kg": "per-kg",
  kg: "per-kg",
  bpm: "1/min",
  "1/min": "1/min",
  "/min": "1/min",
  "b/min": "1/min",
  "beats/min": "1/min",
  "br/min": "1/min",
  "breaths/min": "1/min",
  "min-1": "1/min",
  w: "W",
  watt: "W",
  watts: "W",
  "kpm/min": "kpm/min",
  kpm: "kpm/min",
  "kp·m/min": "kpm/min",
  "km/h": "km/h",
  kmh: "km/h",
  kph: "km/h",
  "m/s": "m/s",
  mph: "mph",
  "%": "%",
  pct: "%",
  percent: "%",
  l: "L",
  ml: "mL",
  mmhg: "mmHg",
  torr: "mmHg",
  kpa: "kPa",
  "mmol/l": "mmol/L",
  mmol: "mmol/L",
  mm: "mmol/L",
  mmoll: "mmol/L",
  "mg/dl": "mg/dL",
  fraction: "fraction",
};

/** Normalise unit text: "mL·min⁻¹" → "ml/min", "(l/min)" → "l/min", "ml·kg-1·min-1" → "ml/kg/min". */
export function normaliseUnitText(text: string): string {
  return text
    .toLowerCase()
    .replace(/[()[\]{}]/g, "")
    .replace(/⁻¹/g, "-1")
    .replace(/\s+/g, "")
    .replace(/([a-z]+)-1/g, "/$1")
    .replace(/[·*.](?=\/)/g, "")
    .replace(/[·*]/g, "/")
    .replace(/\/+/g, "/")
    .replace(/^\//, (m, offset: number, all: string) => (all === "/min" || all === "/kg" ? m : ""));
}

/** Look up a unit text; undefined when it is not a known spelling. */
export function parseUnitText(text: string | null | undefined): string | undefined {
  if (!text) return undefined;
  const n = normaliseUnitText(text);
  if (n.length === 0) return undefined;
  return UNIT_SPELLINGS[n];
}
