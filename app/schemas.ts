import { z } from "zod";
import { PLAUSIBLE_LIMITS, type PlausibleField } from "../lib/core";

const optionalNumber = (field: PlausibleField) => {
  const { min, max, label: what } = PLAUSIBLE_LIMITS[field];
  return z.preprocess(
    (v) => (v === "" || v === null || v === undefined ? undefined : Number(v)),
    z
      .number({ message: `${what} must be a number` })
      .min(min, `${what} must be at least ${min}`)
      .max(max, `${what} must be at most ${max}`)
      .optional(),
  );
};

/** Patient and test details sent with an upload. Ranges: `PLAUSIBLE_LIMITS` (generous; common practice). */
export const testDetailsSchema = z.object({
  label: z.string().trim().max(120).optional().default(""),
  sex: z.enum(["male", "female", ""]).optional().default(""),
  ageY: optionalNumber("ageY"),
  heightCm: optionalNumber("heightCm"),
  weightKg: optionalNumber("weightKg"),
  ergometer: z.enum(["cycle", "treadmill"]).default("cycle"),
  referral: z
    .enum(["general", "heart-failure", "pre-operative", "lung-resection", "pulmonary-hypertension", "transplant", "training"])
    .default("general"),
  fev1L: optionalNumber("fev1L"),
  mvvLMin: optionalNumber("mvvLMin"),
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
