import { CORE_SOURCES, mergeSourceRegistries, type Source } from "../core";
import { BREATH_SOURCES } from "../breath";
import { SIGNAL_SOURCES } from "../signal";
import { THRESHOLD_SOURCES, VT_SOURCES } from "../thresholds";
import { PREDICTED_SOURCES } from "../predicted";
import { INTERPRET_SOURCES } from "../interpret";

/**
 * Every source registry of every layer, merged once. Ids are unique across layers (a clash with a
 * different citation is a programming mistake and throws at start-up).
 */
export const ALL_SOURCES: Record<string, Source> = mergeSourceRegistries(
  CORE_SOURCES,
  BREATH_SOURCES,
  SIGNAL_SOURCES,
  THRESHOLD_SOURCES,
  VT_SOURCES,
  PREDICTED_SOURCES,
  INTERPRET_SOURCES,
);

export function sourceById(id: string): Source | undefined {
  return ALL_SOURCES[id];
}

/** Plain words for an evidence status, as shown beside a citation. */
export const EVIDENCE_WORDS: Record<Source["status"], string> = {
  confirmed: "confirmed in the primary text",
  secondary: "seen only in a secondary reproduction",
  recalled: "recalled, not yet verified in the primary text",
  "common-practice": "common practice",
  "our-choice": "our choice: a setting of this software that no published source fixes",
};

/**
 * What the evidence statuses mean, printed above every list of sources: a status says where a number was seen, not how
 * strong the clinical evidence behind it is.
 */
export const EVIDENCE_LEGEND =
  "Evidence status says where a number was seen, not how strong the clinical evidence is: confirmed = seen in the " +
  "primary text or its abstract; secondary = seen only in a review or a later paper; recalled = not yet checked " +
  "against the source; common practice = usual practice with no single source; our choice = a setting of this " +
  "software that no published source fixes.";
