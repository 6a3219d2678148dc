import type { ReportModel } from "./reportModel";

/** The amendment block of a report in words, as the page and the PDF's first page print it. */
export interface AmendmentWords {
  /** "Amends signed version 1." or, for a draft, "Revises signed version 1 (not signed yet)." */
  heading: string;
  /** "Reason: …", once signed with one. */
  reason?: string;
  /** "Reported values that differ from version 1:" above `lines`, or the sentence saying none differs. */
  changesIntro?: string;
  lines: string[];
}

/**
 * What an amendment says (`ReportModel.amendment`, `ReportModel.valueChanges`): the version it replaces, the signer's
 * reason, and the reported values that differ. Null when the version revises no signed version.
 */
export function amendmentWords(model: ReportModel): AmendmentWords | null {
  const changes = model.valueChanges;
  if (!model.amendment && !changes) return null;
  const since = model.amendment?.revisesVersion ?? changes?.sinceVersion;
  return {
    heading: model.status === "signed" ? `Amends signed version ${since}.` : `Revises signed version ${since} (not signed yet).`,
    ...(model.amendment ? { reason: `Reason: ${model.amendment.reason}` } : {}),
    ...(changes
      ? {
          changesIntro: changes.lines.length
            ? `Reported values that differ from version ${changes.sinceVersion}:`
            : `No key value, threshold or scheme result differs from version ${changes.sinceVersion}.`,
        }
      : {}),
    lines: changes?.lines ?? [],
  };
}
