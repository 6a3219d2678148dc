import { z } from "zod";
import { PLAUSIBLE_LIMITS, type PlausibleField } from "../lib/core";

/**
 * An optional number from a form field: empty → undefined, otherwise a number within [min, max] with plain messages.
 * `integer` asks for a whole number; `decimalComma` also reads "3,5" as 3.5.
 */
export const optionalNumber = (
  min: number,
  max: number,
  what: string,
  { integer = false, decimalComma = false }: { integer?: boolean; decimalComma?: boolean } = {},
) =>
  z.preprocess(
    (v) =>
      v === "" || v === null || v === undefined ? undefined : Number(decimalComma ? String(v).trim().replace(",", ".") : v),
    (integer
      ? z.number({ message: `${what} must be a number` }).int(`${what} must be a whole number`)
      : z.number({ message: `${what} must be a number` })
    )
      .min(min, `${what} must be at least ${min}`)
      .max(max, `${what} must be at most ${max}`)
      .optional(),
  );

/** An optional patient value within its plausibility limits (`PLAUSIBLE_LIMITS`, common practice). */
export const plausibleNumber = (field: PlausibleField) => {
  const { min, max, label } = PLAUSIBLE_LIMITS[field];
  return optionalNumber(min, max, label);
};

/** Patient and test details sent with an upload. Ranges: `PLAUSIBLE_LIMITS` (generous; common practice). */
export const testDetailsSchema = z.object({
  label: z.string().trim().max(120).optional().default(""),
  sex: z.enum(["male", "female", ""]).optional().default(""),
  ageY: plausibleNumber("ageY"),
  heightCm: plausibleNumber("heightCm"),
  weightKg: plausibleNumber("weightKg"),
  ergometer: z.enum(["cycle", "treadmill"]).default("cycle"),
  referral: z
    .enum(["general", "heart-failure", "pre-operative", "lung-resection", "pulmonary-hypertension", "transplant", "training"])
    .default("general"),
  fev1L: plausibleNumber("fev1L"),
  mvvLMin: plausibleNumber("mvvLMin"),
});

export type TestDetails = z.infer<typeof testDetailsSchema>;

export function fieldErrors(error: z.ZodError): Record<string, string> {
  const out: Record<string, string> = {};
  for (const issue of error.issues) {
    const key = String(issue.path[0] ?? "form");
    if (!out[key]) out[key] = issue.message;
  }
  return out;
}
