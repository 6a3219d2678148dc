import { z } from "zod";
import { PDF_PRINTABLE_WORDS, describeChar, unprintableInPdf } from "../lib/report/pdf/pdfText";
import { PLAUSIBLE_LIMITS, STAGE_DURATION_LIMITS_S, type PlausibleField } from "../lib/core";

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

/**
 * The id of a stored test or report version as a page sends it (hidden field, URL or query): a positive whole number.
 * A hand-made or damaged request gets a message a person can act on instead of the validator's own wording.
 */
export const recordId = (what: "test" | "report version") => {
  const message = `The request names no valid ${what} (expected a positive whole number); reload the page`;
  return z.coerce.number({ message }).int({ message }).positive({ message });
};

/** An optional patient value within its plausibility limits (`PLAUSIBLE_LIMITS`, common practice). */
export const plausibleNumber = (field: PlausibleField) => {
  const { min, max, label } = PLAUSIBLE_LIMITS[field];
  return optionalNumber(min, max, label);
};

/**
 * A test's label: the register's name for it and its report's title, so it must print in the report PDF (Latin,
 * Greek and Cyrillic letters and common signs, `unprintableInPdf`) and hold no line breaks or other control characters.
 */
export const labelSchema = z
  .string()
  .trim()
  .max(120, "The label may hold at most 120 characters")
  .refine((s) => !/\p{Cc}/u.test(s), "The label may not hold line breaks, tabs or other control characters")
  .superRefine((s, ctx) => {
    const bad = unprintableInPdf(s);
    if (bad.length)
      ctx.addIssue({
        code: "custom",
        message: `The report PDF prints ${PDF_PRINTABLE_WORDS} and cannot show ${bad.map(describeChar).join(" ")} in the label; leave ${bad.length === 1 ? "it" : "them"} out.`,
      });
  });

/** The stage length of a stage table without a time column, s, as the upload form and the columns page take it. */
export const stageDurationField = () =>
  optionalNumber(STAGE_DURATION_LIMITS_S.min, STAGE_DURATION_LIMITS_S.max, "Stage length (s)");

/** Patient and test details sent with an upload. Ranges: `PLAUSIBLE_LIMITS` (generous; common practice). */
export const testDetailsSchema = z.object({
  label: labelSchema.optional().default(""),
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
  // read by the pre-operative schemes (three-tier: a risk factor); asked with the upload so a pre-operative test is not
  // left without a category until someone finds the clinical-context form
  ischaemicHeartDisease: z.enum(["", "yes", "no"]).optional().default(""),
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

/**
 * Largest exercise-test file the upload form accepts, bytes: 20 MB (20 × 1024 × 1024, the same "MB" the server's body
 * limit uses). A breath-by-breath export of a 2-hour test is a few MB, so 20 MB leaves a wide margin. The form checks it
 * in the browser before sending and `uploadTest` checks it again on the server.
 */
export const MAX_UPLOAD_BYTES = 20 * 1024 * 1024;

/** The limit in words, as the messages give it ("20 MB"). */
export const MAX_UPLOAD_WORDS = `${MAX_UPLOAD_BYTES / (1024 * 1024)} MB`;

/**
 * Server-action body limit (`next.config.ts`), bytes: the largest file plus 1 MB for the form's other fields and the
 * multipart framing, so a file at the limit always reaches `uploadTest` and gets its plain message there.
 */
export const UPLOAD_BODY_LIMIT_BYTES = MAX_UPLOAD_BYTES + 1024 * 1024;

/** A byte count with its digits grouped ("22,020,096"), the same in every locale. */
const groupedBytes = (bytes: number) => String(bytes).replace(/\B(?=(\d{3})+(?!\d))/g, ",");

/**
 * A file size in plain words: "0 bytes", "1 byte", "512 bytes", "3.4 KB", "21.0 MB" (KB and MB of 1024).
 * A size shown in MB that would round to the limit's own figure while being over it also gives the exact bytes.
 */
export function formatFileSize(bytes: number): string {
  if (bytes < 1024) return `${bytes} ${bytes === 1 ? "byte" : "bytes"}`;
  if (bytes < 1024 * 1024) return `${(bytes / 1024).toFixed(1)} KB`;
  const mb = (bytes / (1024 * 1024)).toFixed(1);
  return bytes > MAX_UPLOAD_BYTES && Number(mb) <= MAX_UPLOAD_BYTES / (1024 * 1024)
    ? `${mb} MB (${groupedBytes(bytes)} bytes)`
    : `${mb} MB`;
}

/**
 * What is wrong with a chosen upload file's size, in plain words, or null when it can be sent: an empty file (0 bytes)
 * or one larger than `MAX_UPLOAD_BYTES`. A file exactly at the limit is accepted. Used by the form in the browser and by
 * `uploadTest` on the server, so both give the same words.
 */
export function uploadFileProblem(file: { name: string; size: number }): string | null {
  const name = file.name || "the chosen file";
  if (file.size === 0)
    return `The chosen file ${name} is empty (0 bytes). Choose the exported test file again; if it is empty on disk too, export the test again from the recording system.`;
  if (file.size > MAX_UPLOAD_BYTES)
    return `The chosen file ${name} is ${formatFileSize(file.size)}, larger than the ${MAX_UPLOAD_WORDS} limit. Export the test again with fewer columns or without the long periods before and after it (a breath-by-breath export of a 2-hour test is a few MB).`;
  return null;
}
