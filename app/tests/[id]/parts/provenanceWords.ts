import { FIELD_WORDS } from "@/lib/breath";
import { formatClock, formatNumber } from "@/lib/units";

/** Plain names of the canonical breath fields inside a sentence ("VE/VCO2 interpolated at 11:12"). */
const FIELD_WORD: Record<string, string> = FIELD_WORDS;

/**
 * A provenance label with canonical field names replaced by plain ones and times in seconds given as
 * m:ss ("veLMin/vco2MlMin interpolated at 672 s" → "VE/VCO2 interpolated at 11:12").
 */
export function provenanceLabelText(label: string): string {
  return label
    .replace(/\b([a-z][A-Za-z0-9]*)\b/g, (w) => FIELD_WORD[w] ?? w)
    .replace(/\b(at|of|from|to) (-?\d+(?:\.\d+)?) s\b/g, (_, prep: string, s: string) => `${prep} ${formatClock(Number(s))}`);
}

/** Inputs named outright: plain name and how the value is written. */
const NAMED: Record<string, { name: string; show: (v: number | string | boolean) => string | null }> = {
  timeS: { name: "time", show: (v) => (typeof v === "number" ? formatClock(v) : null) },
  cornerS: { name: "bend in the curve at", show: (v) => (typeof v === "number" ? formatClock(v) : null) },
  vt2S: { name: "VT2 at", show: (v) => (typeof v === "number" ? formatClock(v) : null) },
  lagS: { name: "lag", show: (v) => (typeof v === "number" ? `${formatNumber(v, 0)} s` : null) },
  weightKg: { name: "weight", show: (v) => (typeof v === "number" ? `${formatNumber(v, 1)} kg` : null) },
  ageY: { name: "age", show: (v) => (typeof v === "number" ? `${formatNumber(v, 0)} y` : null) },
  fraction: { name: "share of exercise", show: (v) => (typeof v === "number" ? `${formatNumber(v * 100, 0)} %` : null) },
  breaths: { name: "breaths", show: (v) => (typeof v === "number" ? formatNumber(v, 0) : null) },
  bins: { name: "time bins", show: (v) => (typeof v === "number" ? formatNumber(v, 0) : null) },
  points: { name: "points", show: (v) => (typeof v === "number" ? formatNumber(v, 0) : null) },
  cycles: { name: "cycles", show: (v) => (typeof v === "number" ? formatNumber(v, 0) : null) },
  confidence: { name: "confidence", show: (v) => (typeof v === "string" ? v.replace(/-/g, " ") : null) },
  by: { name: "set by", show: (v) => (typeof v === "string" ? v : null) },
  reason: { name: "reason", show: (v) => (typeof v === "string" ? v : null) },
  note: { name: "note", show: (v) => (typeof v === "string" ? v : null) },
  value: { name: "value", show: (v) => (typeof v === "string" ? v : null) },
  paCO2MmHg: { name: "PaCO2", show: (v) => (typeof v === "number" ? `${formatNumber(v, 1)} mmHg` : null) },
  fev1L: { name: "FEV1", show: (v) => (typeof v === "number" ? `${formatNumber(v, 2)} L` : null) },
};

/** Unit endings of input names: the unit's written form and its decimals. Longest first. */
const UNIT_SUFFIX: { suffix: string; unit: string; decimals: number }[] = [
  { suffix: "MlKgMin", unit: "mL/kg/min", decimals: 1 },
  { suffix: "MlMin", unit: "mL/min", decimals: 0 },
  { suffix: "LMin", unit: "L/min", decimals: 1 },
  { suffix: "MmHg", unit: "mmHg", decimals: 1 },
  { suffix: "Bpm", unit: "bpm", decimals: 0 },
  { suffix: "Pct", unit: "%", decimals: 0 },
  { suffix: "W", unit: "W", decimals: 0 },
];

/** Words of a camel-case stem written as a reader would ("vePeak" → "VE peak", "restingVe" → "resting VE"). */
const TRADE_WORDS: Record<string, string> = { ve: "VE", vo2: "VO2", vco2: "VCO2", hr: "HR", mvv: "MVV", petco2: "PETCO2" };
function stemWords(stem: string): string {
  return stem
    .replace(/([a-z0-9])([A-Z])/g, "$1 $2")
    .split(" ")
    .map((w) => TRADE_WORDS[w.toLowerCase()] ?? w.toLowerCase())
    .join(" ");
}

/**
 * One provenance input in plain words ("time 11:12", "VE peak 90.3 L/min", "methods ventilatory
 * equivalents"), or `null` when the input cannot be named: such inputs are left out rather than shown as
 * code. `methodLabels` maps threshold method ids to their labels (from the analysis result's methods).
 */
export function inputText(
  key: string,
  value: number | string | boolean | null,
  methodLabels: Record<string, string> = {},
): string | null {
  if (value === null) return null;
  if (key === "methods" && typeof value === "string") {
    const names = value
      .split(",")
      .map((id) => methodLabels[id.trim()])
      .filter((x): x is string => Boolean(x));
    return names.length > 0 ? `methods: ${names.join("; ")}` : null;
  }
  const named = NAMED[key];
  if (named) {
    const shown = named.show(value);
    return shown === null ? null : `${named.name} ${shown}`;
  }
  if (typeof value !== "number" || !Number.isFinite(value)) return null;
  for (const u of UNIT_SUFFIX) {
    if (key.length > u.suffix.length && key.endsWith(u.suffix)) {
      const stem = key.slice(0, -u.suffix.length);
      const unit = u.unit === "%" ? " %" : `\u00a0${u.unit}`;
      return `${stemWords(stem)} ${formatNumber(value, u.decimals)}${unit}`;
    }
  }
  return null;
}
