import type { ComparisonTrace } from "../interpret";
import { nearCutoffNote, variableInfo } from "../interpret";
import { formatNumber } from "../units";

/**
 * Words for the yes/no variables of the interpretation rules, as a clinician writes them: the
 * phrase when the variable is true and when it is false. Variables not listed read "<label>: yes/no".
 */
const BOOLEAN_PHRASES: Record<string, readonly [string, string]> = {
  vo2Plateau: ["VO2 plateau present", "no VO2 plateau"],
  vt1Determined: ["VT1 determined", "VT1 not determined"],
  o2PulsePlateau: ["O2 pulse flat or falling", "O2 pulse still rising"],
  eovPresent: ["exercise oscillatory ventilation present", "no exercise oscillatory ventilation"],
  betaBlocker: ["taking a beta-blocker", "no beta-blocker"],
  atrialFibrillation: ["atrial fibrillation", "no atrial fibrillation recorded"],
  ischaemicHeartDisease: ["ischaemic heart disease known", "no known ischaemic heart disease"],
};

/** Comparison operators in the signs a clinician reads (never code such as ">=" or "=="). */
const OP_SIGNS: Record<string, string> = { "<": "<", "<=": "≤", ">": ">", ">=": "≥", "==": "=", "!=": "≠" };

function decimalsOfLiteral(n: number): number {
  const s = String(n);
  const i = s.indexOf(".");
  return i < 0 ? 0 : s.length - i - 1;
}

function booleanPhrase(variable: string, label: string, value: boolean): string {
  const words = BOOLEAN_PHRASES[variable];
  if (words) return value ? words[0] : words[1];
  return `${label}: ${value ? "yes" : "no"}`;
}

const withUnit = (text: string, unit: string) => (unit ? `${text} ${unit}` : text);

/**
 * The patient's value in one comparison of the interpretation path, rounded to the variable's
 * display decimals with its unit: "Peak RER 1.07", "Peak HR 82 % predicted", "VO2 plateau: not
 * available", "VT1 determined". Display only; the comparison itself used the unrounded value.
 */
export function formatComparisonValue(c: ComparisonTrace): string {
  const info = variableInfo(c.variable);
  if (c.value === null || c.value === undefined) return `${c.label}: not available`;
  if (typeof c.value === "boolean") return booleanPhrase(c.variable, c.label, c.value);
  if (typeof c.value === "string") return `${c.label}: ${c.value}`;
  // display decimals; beside a numeric cut-off that the rounding hides, the side in words ("1.05 (just above the cut-off)")
  const side = typeof c.cutoff === "number" ? nearCutoffNote(c.variable, c.value, c.cutoff) : "";
  return `${c.label} ${withUnit(formatNumber(c.value, info.decimals ?? 0), c.unit)}${side}`;
}

/**
 * The cut-off of one comparison in words: "Peak RER > 1.05", "Peak HR ≥ 85 % predicted",
 * "VO2 plateau present", "Sex: male or female". A cut-off keeps at least the variable's display
 * decimals and never fewer than the published value has (1.10 stays "1.10").
 */
export function formatComparisonCutoff(c: ComparisonTrace): string {
  const info = variableInfo(c.variable);
  const cut = c.cutoff;
  if (Array.isArray(cut)) return `${c.label}: ${c.op === "in" ? "" : "not "}${cut.join(" or ")}`;
  if (typeof cut === "boolean") {
    const wanted = c.op === "!=" ? !cut : cut;
    return booleanPhrase(c.variable, c.label, wanted);
  }
  if (typeof cut === "string") return `${c.label} ${c.op === "!=" ? "not " : ""}${cut}`;
  const sign = OP_SIGNS[c.op] ?? c.op;
  const decimals = Math.max(info.decimals ?? 0, decimalsOfLiteral(cut as number));
  return `${c.label} ${sign} ${withUnit(formatNumber(cut as number, decimals), c.unit)}`;
}
