import { z } from "zod";

const optionalNumber = (min: number, max: number, what: string) =>
  z.preprocess(
    (v) => (v === "" || v === null || v === undefined ? undefined : Number(v)),
    z
      .number({ message: `${what} must be a number` })
      .min(min, `${what} must be at least ${min}`)
      .max(max, `${what} must be at most ${max}`)
      .optional(),
  );

/** Patient and test details sent with an upload. Ranges are generous plausibility limits (common practice). */
export const testDetailsSchema = z.object({
  label: z.string().trim().max(120).optional().default(""),
  sex: z.enum(["male", "female", ""]).optional().default(""),
  ageY: optionalNumber(5, 110, "Age (years)"),
  heightCm: optionalNumber(100, 230, "Height (cm)"),
  weightKg: optionalNumber(20, 300, "Weight (kg)"),
  ergometer: z.enum(["cycle", "treadmill"]).default("cycle"),
  referral: z
    .enum(["general", "heart-failure", "pre-operative", "lung-resection", "pulmonary-hypertension", "transplant", "training"])
    .default("general"),
  fev1L: optionalNumber(0.2, 8, "FEV1 (L)"),
  mvvLMin: optionalNumber(10, 300, "Measured MVV (L/min)"),
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
