import {
  NUMERIC_FIELDS,
  parseUnitText,
  QUANTITY_OF,
  UNIT_KEYS_BY_FIELD,
  type ColumnDecision,
  type NumericField,
} from "@/lib/breath";
import { displayUnit, UNIT_CONVERSIONS } from "@/lib/units";

export type FieldKey = NumericField | "phase";

/** Plain names of the canonical fields, as the review page shows them. */
export const FIELD_LABEL: Record<FieldKey, string> = {
  timeS: "Time",
  vo2MlMin: "VO2",
  vco2MlMin: "VCO2",
  veLMin: "VE (ventilation)",
  hrBpm: "Heart rate",
  workW: "Work rate",
  speedKmh: "Speed",
  gradePct: "Grade",
  rrBrMin: "Respiratory rate",
  vtL: "Tidal volume",
  peto2MmHg: "PETO2",
  petco2MmHg: "PETCO2",
  spo2Pct: "SpO2",
  stage: "Stage number",
  lactateMmolL: "Lactate",
  phase: "Phase or marker text",
};

/** Readings the importer understands beyond the linear conversions of lib/units (unit text → shown label). */
const SPECIAL_UNITS: Partial<Record<FieldKey, { text: string; label: string }[]>> = {
  timeS: [{ text: "m:ss", label: "m:ss (clock)" }],
  vo2MlMin: [{ text: "mL/kg/min", label: "mL/kg/min (× body mass)" }],
  hrBpm: [
    { text: "ms", label: "ms (R–R interval: 60 000 / R–R)" },
    { text: "s", label: "s (R–R interval: 60 / R–R)" },
  ],
};

export interface UnitOption {
  /** Unit text sent to the importer (a spelling `parseUnitText` knows). */
  value: string;
  label: string;
}

export interface FieldOption {
  value: FieldKey;
  label: string;
  units: UnitOption[];
}

/**
 * Units offered for a field: the conversions lib/units knows for its quantity, plus the importer's
 * special readings (per-kg VO2, clock times), kept only when the importer accepts them for that field.
 */
export function unitOptions(field: FieldKey): UnitOption[] {
  const q = field === "phase" || field === "stage" ? undefined : QUANTITY_OF[field];
  const accepted = UNIT_KEYS_BY_FIELD[field];
  const out: UnitOption[] = [];
  if (q)
    for (const u of Object.keys(UNIT_CONVERSIONS[q]))
      if (accepted.includes(parseUnitText(u) ?? "")) out.push({ value: u, label: u === "1/min" ? "1/min" : displayUnit(u) });
  for (const s of SPECIAL_UNITS[field] ?? [])
    if (accepted.includes(parseUnitText(s.text) ?? "")) out.push({ value: s.text, label: s.label });
  return out;
}

/** Every field the user can assign a column to, with its units. */
export function fieldOptions(): FieldOption[] {
  return ([...NUMERIC_FIELDS, "phase"] as FieldKey[]).map((f) => ({ value: f, label: FIELD_LABEL[f], units: unitOptions(f) }));
}

/** Who made a decision, in words. */
export function decidedByText(d: ColumnDecision["decidedBy"]): string {
  switch (d) {
    case "plain-convention":
      return "plain column convention";
    case "recognised-name":
      return "recognised name";
    case "user":
      return "set by user";
    default:
      return "not used";
  }
}

/**
 * The importer's reason without its leading "who decided" words when the page already shows them as a tag
 * ("set by user: L/min; …" under the tag "set by user" → ": L/min; …"), so they are not said twice. The
 * separator is kept, so tag and reason read as one sentence ("set by user: L/min; …").
 */
export function reasonAfterTag(reason: string, tag: string): string {
  if (!tag || !reason.toLowerCase().startsWith(tag.toLowerCase())) return reason;
  return reason.slice(tag.length).trimStart();
}

/** A field's label without its explanatory words, for use beside a unit ("VE (ventilation)" → "VE"). */
export function shortFieldLabel(field: FieldKey): string {
  return FIELD_LABEL[field].replace(/\s*\(.*\)$/, "");
}

/** "VO2 (L/min)", "ignored", "VO2 kept per kg (mL/kg/min)". */
export function readAsText(c: Pick<ColumnDecision, "field" | "unit" | "storedAs">): string {
  if (c.storedAs === "vo2MlKgMin" && c.field === null) return `VO2 kept per kg${c.unit ? ` (${c.unit})` : ""}`;
  if (!c.field) return "ignored";
  return `${FIELD_LABEL[c.field]}${c.unit ? ` (${c.unit})` : ""}`;
}

/**
 * What a column was read as, short, for the analysis page's summary of the file: "Time (s)", "VE (L/min)",
 * "Heart rate (bpm)", "Respiratory rate (breaths/min)" (per-minute counts named as everywhere on that page),
 * "ignored".
 */
export function readAsShortText(c: Pick<ColumnDecision, "field" | "unit" | "storedAs">): string {
  if (c.storedAs === "vo2MlKgMin" && c.field === null) return `VO2 kept per kg${c.unit ? ` (${c.unit})` : ""}`;
  if (!c.field) return "ignored";
  const perMinute = c.field === "hrBpm" ? "bpm" : c.field === "rrBrMin" ? "breaths/min" : c.unit;
  const unit = c.unit === "1/min" ? perMinute : c.unit;
  return `${shortFieldLabel(c.field)}${unit ? ` (${unit})` : ""}`;
}
