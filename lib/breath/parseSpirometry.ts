import { z } from "zod";
import { makeIssue, PLAUSIBLE_LIMITS, plausibilityProblem, type Issue, type PlausibleField, type Spirometry } from "../core";

const within = (f: PlausibleField) => z.number().min(PLAUSIBLE_LIMITS[f].min).max(PLAUSIBLE_LIMITS[f].max).optional();

/**
 * Plausible resting spirometry in canonical units (common practice; generous; `PLAUSIBLE_LIMITS`): FEV1 0.2–8 L,
 * FVC 0.3–10 L, MVV 10–300 L/min, % predicted 5–200.
 */
export const spirometrySchema = z.object({
  fev1L: within("fev1L"),
  fvcL: within("fvcL"),
  mvvLMin: within("mvvLMin"),
  dlcoPctPred: within("dlcoPctPred"),
  fev1PctPred: within("fev1PctPred"),
});

/**
 * Accept resting spirometry typed by a user or read from a record (numbers or numeric strings, decimal
 * comma allowed). Each value that is missing a number or lies outside its plausible range is left out
 * with a warning; FEV1 above FVC is flagged. Never throws.
 */
export function parseSpirometry(input: unknown): { spirometry: Spirometry | null; issues: Issue[] } {
  const issues: Issue[] = [];
  if (input === null || typeof input !== "object") return { spirometry: null, issues };
  const out: Spirometry = {};
  for (const [key, schema] of Object.entries(spirometrySchema.shape)) {
    const raw = (input as Record<string, unknown>)[key];
    if (raw === undefined || raw === null || raw === "") continue;
    const num = typeof raw === "string" ? Number(raw.trim().replace(",", ".")) : raw;
    const parsed = schema.safeParse(num);
    if (parsed.success && parsed.data !== undefined) (out as Record<string, number>)[key] = parsed.data;
    else
      issues.push(
        makeIssue(
          "warning",
          "spirometry-invalid",
          `${plausibilityProblem(key as PlausibleField, typeof num === "number" ? num : NaN) ?? `${PLAUSIBLE_LIMITS[key as PlausibleField].label} is not a plausible number, got ${String(raw)}`}; it was left out.`,
          { field: key },
        ),
      );
  }
  if (out.fev1L !== undefined && out.fvcL !== undefined && out.fev1L > out.fvcL) {
    issues.push(
      makeIssue("warning", "spirometry-invalid", `FEV1 (${out.fev1L} L) is larger than FVC (${out.fvcL} L); check the values.`, {
        field: "fev1L",
      }),
    );
  }
  return { spirometry: Object.keys(out).length > 0 ? out : null, issues };
}
