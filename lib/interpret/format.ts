import type { EvidenceStatus } from "../core";
import { formatNumber } from "../units";
import { variableInfo } from "./variables";

const STRENGTH: Record<EvidenceStatus, number> = {
  recalled: 0,
  "common-practice": 1,
  "our-choice": 1,
  secondary: 2,
  confirmed: 3,
};

/** The weakest of several evidence statuses (a conclusion is only as strong as its weakest input). */
export function weakestStatus(statuses: readonly EvidenceStatus[]): EvidenceStatus {
  let out: EvidenceStatus = "confirmed";
  for (const s of statuses) if (STRENGTH[s] < STRENGTH[out]) out = s;
  return out;
}

function literalDecimals(n: number): number {
  const s = String(n);
  const i = s.indexOf(".");
  return i < 0 ? 0 : s.length - i - 1;
}

/** A variable's value for display, with the variable's decimals. */
export function formatValue(variable: string, value: number | string | boolean | null | undefined): string {
  if (value === null || value === undefined) return "not available";
  if (typeof value === "boolean") return value ? "yes" : "no";
  if (typeof value === "string") return value;
  return formatNumber(value, variableInfo(variable).decimals ?? 0);
}

/**
 * A computed value that differs from a cut-off only by floating-point rounding (57 × 10/19 = 30.000000000000004 for an
 * exact 30) is the cut-off: relative difference ≤ 1e-9, far below any measurement's precision (common practice).
 */
export function snapToCutoff(value: number, cutoff: number): number {
  return Math.abs(value - cutoff) <= 1e-9 * Math.max(1, Math.abs(cutoff)) ? cutoff : value;
}

/**
 * Which side of a cut-off a value lies on when the value at its display decimals does not show it. Values beside a
 * cut-off keep the variable's display decimals like everywhere else (more would be spurious precision: a
 * breath-by-breath "4.01" is not known to the hundredth), and the side is said in words (common practice):
 * " (just above the cut-off)" for 4.01 against 4 (shown "4.0"), " (just below the cut-off)" for 1.046 against 1.05
 * (shown "1.05"); "" when the rounded value already reads on its own side, or equals the cut-off.
 */
export function nearCutoffNote(variable: string, computed: number, cutoff: number): string {
  const value = snapToCutoff(computed, cutoff);
  if (!Number.isFinite(value) || value === cutoff) return "";
  const shown = Number(value.toFixed(variableInfo(variable).decimals ?? 0));
  if (value > cutoff && !(shown > cutoff)) return " (just above the cut-off)";
  if (value < cutoff && !(shown < cutoff)) return " (just below the cut-off)";
  return "";
}

/** A cut-off for display: at least the variable's decimals, never fewer than the literal has. */
export function formatCutoff(variable: string, cutoff: number): string {
  return formatNumber(cutoff, Math.max(variableInfo(variable).decimals ?? 0, literalDecimals(cutoff)));
}

/** A category value in plain words (the variable's `values` map), e.g. "physiological-limit" → "physiological limit". */
export function categoryText(variable: string, value: string): string {
  return variableInfo(variable).values?.[value] ?? value.replace(/-/g, " ");
}

export const OP_TEXT: Record<string, string> = {
  "<": "<",
  "<=": "≤",
  ">": ">",
  ">=": "≥",
  "==": "=",
  "!=": "≠",
  in: "in",
  "not in": "not in",
};

export function unique<T>(items: readonly T[]): T[] {
  return [...new Set(items)];
}

/** "a", "a and b", "a, b and c". */
export function andList(items: readonly string[]): string {
  return items.length > 1 ? `${items.slice(0, -1).join(", ")} and ${items[items.length - 1]}` : (items[0] ?? "");
}

/** The text with its first letter in lower case, to run on inside a sentence ("Low risk (…)" → "low risk (…)"). */
export const lowerFirst = (t: string) => t.charAt(0).toLowerCase() + t.slice(1);
