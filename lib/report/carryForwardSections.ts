import type { ReportSection } from "./reportModel";

/** The report version whose text may be carried into a new draft. */
export interface PreviousReportText {
  reportId: number;
  /** 1-based version number among the test's report versions. */
  version: number;
  status: "draft" | "signed";
  sections: readonly ReportSection[];
}

export interface CarryForwardInput {
  previous: PreviousReportText;
  /** The text the application generated for the previous version's analysis (to tell edited sections apart). */
  previousGenerated: readonly ReportSection[];
  /** The text generated for the new analysis: the new draft's default. */
  nextGenerated: readonly ReportSection[];
  /**
   * What changed between the two analyses, most decisive first: interpretation findings
   * (`describeInterpretationChanges`), then displayed values (`describeValueChanges`).
   */
  changes: readonly string[];
}

export interface CarryForwardResult {
  sections: ReportSection[];
  /** Titles of the sections whose reviewer text was carried (empty: the new draft is the generated text). */
  carried: string[];
}

/**
 * How the text generated for one section changed between two analyses, paragraph by paragraph:
 * "Generated text now says: “…”" for a paragraph that is new, "Generated text no longer says: “…”"
 * for one that went (whitespace ignored). These lines come first in a carried section's note.
 */
function generatedTextChanges(before: readonly string[] | undefined, after: readonly string[] | undefined): string[] {
  const clean = (p: string) => p.replace(/\s+/g, " ").trim();
  const a = (before ?? []).map(clean).filter(Boolean);
  const b = (after ?? []).map(clean).filter(Boolean);
  return [
    ...a.filter((p) => !b.includes(p)).map((p) => `Generated text no longer says: “${p}”`),
    ...b.filter((p) => !a.includes(p)).map((p) => `Generated text now says: “${p}”`),
  ];
}

const normalise = (paragraphs: readonly string[]) =>
  paragraphs
    .map((p) => p.replace(/\s+/g, " ").trim())
    .filter(Boolean)
    .join("\n\n");

/**
 * The first text of a new draft when the analysis changed (a threshold override, removed override
 * or other settings): the reviewer's own edited sections are kept, each marked with a re-check note
 * that names the earlier version, the values that changed and the text generated from the current
 * numbers; sections the reviewer never edited take the newly generated text. A section counts as
 * edited when its text differs from what was generated for the previous analysis (whitespace
 * ignored) or when it still carries an unresolved re-check note. An edited section that the new
 * analysis no longer generates is kept at the end with its own note, so no reviewer text is lost.
 * Never silent: every carried section has a note, even when no displayed value changed.
 *
 * Pure function; inputs are not changed.
 */
export function carryForwardSections(input: CarryForwardInput): CarryForwardResult {
  const { previous, previousGenerated, nextGenerated, changes } = input;
  const generatedBefore = new Map(previousGenerated.map((s) => [s.id, normalise(s.paragraphs)]));
  const edited = new Map(
    previous.sections
      .filter((s) => s.recheck !== undefined || generatedBefore.get(s.id) !== normalise(s.paragraphs))
      .map((s) => [s.id, s]),
  );
  const versionWords = `version ${previous.version} (${previous.status === "signed" ? "signed" : "draft"})`;
  const generatedBeforeParagraphs = new Map(previousGenerated.map((s) => [s.id, s.paragraphs]));
  const generatedAfterParagraphs = new Map(nextGenerated.map((s) => [s.id, s.paragraphs]));
  const changeList = (s: ReportSection) => [
    ...new Set([
      ...generatedTextChanges(generatedBeforeParagraphs.get(s.id), generatedAfterParagraphs.get(s.id)),
      ...(s.recheck?.changes ?? []),
      ...changes,
    ]),
  ];
  const reasonFor = (s: ReportSection, stillGenerated: boolean) => {
    const lead = `Your text from report ${versionWords} was kept, but it was written for an earlier analysis.`;
    const numbers = changeList(s).length
      ? " The numbers changed since it was written, and with them what the report concludes (listed below, findings first):"
      : " The analysis settings changed, although no reported value changed:";
    const end = stillGenerated
      ? " re-check the text against the current values before signing."
      : " this section is no longer part of the generated report; keep, edit or empty it before signing.";
    return lead + numbers + end;
  };
  const carried: string[] = [];
  const sections: ReportSection[] = nextGenerated.map((g) => {
    const mine = edited.get(g.id);
    if (!mine) return { id: g.id, title: g.title, paragraphs: [...g.paragraphs] };
    carried.push(mine.title);
    return {
      id: g.id,
      title: mine.title,
      paragraphs: [...mine.paragraphs],
      recheck: {
        fromVersion: previous.version,
        fromReportId: previous.reportId,
        reason: reasonFor(mine, true),
        changes: changeList(mine),
        generated: [...g.paragraphs],
      },
    };
  });
  const nextIds = new Set(nextGenerated.map((s) => s.id));
  for (const mine of edited.values()) {
    if (nextIds.has(mine.id) || normalise(mine.paragraphs) === "") continue;
    carried.push(mine.title);
    sections.push({
      id: mine.id,
      title: mine.title,
      paragraphs: [...mine.paragraphs],
      recheck: {
        fromVersion: previous.version,
        fromReportId: previous.reportId,
        reason: reasonFor(mine, false),
        changes: changeList(mine),
        generated: [],
      },
    });
  }
  return { sections, carried };
}
