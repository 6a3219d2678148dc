import "server-only";
import { latestSettings, type StoredTest } from "@/lib/store/tests";

/**
 * Which version of a test's details a page showed: the hash of its record (every correction of the patient, spirometry,
 * clinical context or conduct makes a new one). Forms send it back, so a save from a page opened before another save
 * is refused instead of silently undoing that save with the old values still on its screen.
 */
export function recordToken(test: Pick<StoredTest, "recordSha256">): string {
  return test.recordSha256 ?? "no-record";
}

export const RECORD_CHANGED_ELSEWHERE =
  "Not saved: this test's details were changed elsewhere (another tab or another person) after this page was opened, " +
  "so this page no longer shows the current details and saving it could put old values back. Your values are still in " +
  "the form: note them, reload the page to see the current details, and make your change again.";

export const NO_TEST = "This test does not exist (it may have been removed); go back to the register.";

/** Null when the page's token is the test's current one; else why the save is refused. */
export function changedSince(test: StoredTest | null, sent: unknown): string | null {
  if (!test) return NO_TEST;
  if (typeof sent !== "string" || sent === "")
    return "The page did not say which version of the test it showed; reload the page.";
  return sent === recordToken(test) ? null : RECORD_CHANGED_ELSEWHERE;
}

/**
 * Which analysis version a test page showed (its id, or "none"): the settings, override and exercise-phase forms send
 * it back, since each builds the new version from the latest one and a stale page would silently drop a change made
 * since (every correction of the record makes a new version too).
 */
export function settingsToken(testId: number): string {
  return String(latestSettings(testId)?.id ?? "none");
}

export const SETTINGS_CHANGED_ELSEWHERE =
  "Not saved: a new analysis version of this test was made elsewhere (another tab or another person) after this page " +
  "was opened, so this page no longer shows the current settings and saving it could put old ones back. Your values " +
  "are still in the form: note them, reload the page, and make your change again.";

/** Null when the page's analysis version is the test's latest; else why the save is refused (the test must exist). */
export function settingsChangedSince(testId: number, sent: unknown): string | null {
  if (typeof sent !== "string" || sent === "") return "The page did not say which analysis version it showed; reload the page.";
  return sent === settingsToken(testId) ? null : SETTINGS_CHANGED_ELSEWHERE;
}
