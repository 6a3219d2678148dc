import type { EvidenceStatus } from "../core";
import { formatNumber } from "../units";
import { variableInfo } from "./variables";

const STRENGTH: Record<EvidenceStatus, number> = { recalled: 0, "common-practice": 1, secondary: 2, confirmed: 3 };

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
 * A value shown beside a cut-off: with the variable's decimals, or with up to three more when those would show it equal
 * to a cut-off it is not ("Peak RER 1.054 > 1.05", not "1.05 > 1.05"; a value that equals the cut-off stays as it is).
 */
export function formatValueAgainst(variable: string, value: number, cutoff: number): string {
  const base = variableInfo(variable).decimals ?? 0;
  const shown = formatNumber(value, base);
  if (value === cutoff || shown !== formatCutoff(variable, cutoff)) return shown;
  for (let d = base + 1; d <= base + 3; d++)
    if (formatNumber(value, d) !== formatNumber(cutoff, d)) return formatNumber(value, d);
  return shown;
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
