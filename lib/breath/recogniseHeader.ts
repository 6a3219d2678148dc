import { BODY_MASS_NAMES, COLUMN_SYNONYMS, DERIVED_NAMES, QUALIFIER_TOKENS, RECORD_ID_NAMES } from "./columnSynonyms";
import { CANONICAL_UNIT_OF } from "./inferColumnUnit";
import { parseUnitText } from "./parseUnitText";
import type { NumericField } from "./types";

/** What a header alone says about its column. */
export interface HeaderReading {
  /** Normalised name that matched (or the whole normalised header when nothing matched). */
  name: string;
  kind: "quantity" | "record-id" | "body-mass" | "derived" | "unknown";
  field?: NumericField | "phase";
  /** Unit key found in the header (see `UNIT_SPELLINGS`), if any. */
  unit?: string;
  /** Unit text as written, for reasons shown to the user. */
  unitText?: string;
  /** The header matched the plain column convention exactly (e.g. `vo2_ml_min`). */
  plain: boolean;
}

const BY_NAME = new Map<string, { field: NumericField | "phase"; impliedUnit?: string }>();
for (const entry of COLUMN_SYNONYMS)
  for (const n of entry.names) BY_NAME.set(n, { field: entry.field, impliedUnit: entry.impliedUnit });
const QUALIFIERS = new Set(QUALIFIER_TOKENS);

/**
 * Read a header: find the quantity it names from the synonym table and the unit it states
 * (in brackets, or as trailing tokens as in `VO2_L_min`). Pure and cheap; magnitudes are judged later.
 *
 * @example recogniseHeader("V'O2 (l/min)") → { kind: "quantity", field: "vo2MlMin", unit: "L/min", … }
 */
export function recogniseHeader(header: string, plainColumns: Record<string, NumericField | "phase">): HeaderReading {
  const trimmed = header.trim();
  const plainField = plainColumns[trimmed.toLowerCase()];
  if (plainField) {
    return {
      name: trimmed.toLowerCase(),
      kind: "quantity",
      field: plainField,
      unit: plainField === "phase" || plainField === "stage" ? undefined : CANONICAL_UNIT_OF[plainField],
      plain: true,
    };
  }
  let unitText: string | undefined;
  const bracket = /[([{]([^)\]}]*)[)\]}]/.exec(trimmed);
  let rest = trimmed;
  if (bracket) {
    unitText = bracket[1].trim();
    rest = trimmed.replace(bracket[0], " ");
  }
  const ascii = rest
    .normalize("NFD")
    .replace(/[\u0300-\u036f]/g, "")
    .toLowerCase()
    .replace(/[’'`´]/g, "")
    .replace(/(^|[^a-z])v\.(?=[a-z])/g, "$1v");
  const tokens = ascii.split(/[^a-z0-9%:]+/).filter((t) => t.length > 0 && !QUALIFIERS.has(t));
  for (let k = tokens.length; k >= 1; k--) {
    const name = tokens.slice(0, k).join("");
    const tail = tokens.slice(k);
    const hit = BY_NAME.get(name);
    const tailText = tail.join("/");
    const tailUnit = tail.length > 0 ? parseUnitText(tailText) : undefined;
    if (hit && (tail.length === 0 || (tailUnit !== undefined && unitFits(hit.field, tailUnit)))) {
      const bracketUnit = parseUnitText(unitText);
      const headerUnit = bracketUnit !== undefined && unitFits(hit.field, bracketUnit) ? bracketUnit : tailUnit;
      const unit = hit.impliedUnit ? (parseUnitText(hit.impliedUnit) ?? headerUnit) : headerUnit;
      return {
        name,
        kind: "quantity",
        field: hit.field,
        unit,
        unitText: unitText ?? (tail.length > 0 ? tailText : undefined),
        plain: false,
      };
    }
  }
  const whole = tokens.join("");
  const first = tokens.length > 0 ? tokens[0] : whole;
  if (RECORD_ID_NAMES.includes(whole)) return { name: whole, kind: "record-id", plain: false };
  if (BODY_MASS_NAMES.includes(whole) || BODY_MASS_NAMES.includes(first))
    return { name: whole, kind: "body-mass", unitText, plain: false };
  if (DERIVED_NAMES.includes(whole) || DERIVED_NAMES.includes(first)) return { name: whole, kind: "derived", plain: false };
  return { name: whole, kind: "unknown", plain: false };
}

/** Unit keys that make sense for each field (a header tail that is not one of these is not a unit). */
export const UNIT_KEYS_BY_FIELD: Record<NumericField | "phase", readonly string[]> = {
  timeS: ["s", "min", "ms", "h", "clock"],
  vo2MlMin: ["mL/min", "L/min", "per-kg"],
  vco2MlMin: ["mL/min", "L/min"],
  veLMin: ["L/min", "mL/min"],
  hrBpm: ["1/min", "ms", "s"],
  workW: ["W", "kpm/min"],
  speedKmh: ["km/h", "m/s", "mph"],
  gradePct: ["%"],
  rrBrMin: ["1/min", "ms", "s"],
  vtL: ["L", "mL"],
  peto2MmHg: ["mmHg", "kPa"],
  petco2MmHg: ["mmHg", "kPa"],
  spo2Pct: ["%", "fraction"],
  stage: [],
  lactateMmolL: ["mmol/L", "mg/dL"],
  phase: [],
};

function unitFits(field: NumericField | "phase", unit: string): boolean {
  return UNIT_KEYS_BY_FIELD[field].includes(unit);
}
