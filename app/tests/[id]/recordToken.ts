import "server-only";
import { getTest } from "@/lib/store/tests";

/**
 * Which version of a test's details a page showed: the hash of its record (every correction of the patient, spirometry,
 * clinical context or conduct makes a new one). Forms send it back, so a save from a page opened before another save
 * is refused instead of silently undoing that save with the old values still on its screen.
 */
export function recordToken(testId: number): string {
  return getTest(testId)?.recordSha256 ?? "no-record";
}

export const RECORD_CHANGED_ELSEWHERE =
  "Not saved: this test's details were changed elsewhere (another tab or another person) after this page was opened, " +
  "and saving now would undo that change. Your values are still in the form: note them, reload the page to see the " +
  "current details, and make your change again.";

/** Null when the page's token is the test's current one; else why the save is refused. */
export function changedSince(testId: number, sent: unknown): string | null {
  if (typeof sent !== "string" || sent === "")
    return "The page did not say which version of the test it showed; reload the page.";
  return sent === recordToken(testId) ? null : RECORD_CHANGED_ELSEWHERE;
}
