import { z } from "zod";

/** Longest text accepted in one section (characters): a generous page of prose. */
export const SECTION_MAX_CHARS = 4000;

/** One edited section as sent by the draft form: its id and its text (paragraphs separated by blank lines). */
export const draftFormSchema = z.object({
  testId: z.coerce.number().int().positive(),
  reportId: z.coerce.number().int().positive(),
  sections: z
    .array(
      z.object({
        id: z.string().regex(/^[a-z0-9-]+$/),
        title: z.string().trim().min(1).max(120),
        text: z.string().max(SECTION_MAX_CHARS, `A section may hold at most ${SECTION_MAX_CHARS} characters`),
      }),
    )
    .min(1)
    .max(20),
});

export const ATTESTATION =
  "I have reviewed the data, the values, the charts and the text of this report, and I take clinical responsibility for it as signed.";

export const signFormSchema = z.object({
  testId: z.coerce.number().int().positive(),
  reportId: z.coerce.number().int().positive(),
  signer: z
    .string()
    .trim()
    .min(3, "Enter your full name (at least 3 characters)")
    .max(120, "The name may hold at most 120 characters"),
  attest: z.literal("on", { message: "Confirm that you have reviewed the report" }),
});

/** Paragraphs from a textarea: split at blank lines, trimmed, empty ones dropped. */
export function toParagraphs(text: string): string[] {
  return text
    .replace(/\r\n/g, "\n")
    .split(/\n\s*\n/)
    .map((p) => p.trim())
    .filter((p) => p.length > 0);
}
