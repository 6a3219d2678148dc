import { defineSources, type Source } from "../core/source";
import { EQUATIONS } from "./equations";
import type { ReferenceEquation } from "./equationSchema";

/** Short citation from a data file's `source`: "Authors. Title. Journal Year;Vol(Issue):Pages". */
export function formatCitation(eq: ReferenceEquation): string {
  const s = eq.source;
  const vol = s.volume ? `;${s.volume}${s.issue ? `(${s.issue})` : ""}` : "";
  const pages = s.pages ? `:${s.pages}` : "";
  return `${s.authors}. ${s.title}. ${s.journal} ${s.year}${vol}${pages}`;
}

/** Sources this layer cites that are not themselves equation files. */
const EXTRA = defineSources({
  "practical-guide-2021": {
    citation: "Practical guide to cardiopulmonary exercise testing in adults. Respir Res 2021 (s12931-021-01895-6), Table 1",
    status: "secondary",
    note: "Peak VO2 ≥ 85% predicted read as normal (used as the default % limit when an equation has no LLN).",
  },
  "otto-yanez-2020": {
    citation: "Otto-Yáñez M et al. Front Physiol 2020;11:537 (MVV estimated from FEV1: five multipliers compared)",
    status: "confirmed",
    doi: "10.3389/fphys.2020.00537",
    note: "Advises against estimating MVV from FEV1.",
  },
});

/**
 * Source registry of the predicted layer: one entry per equation file (id = equation id, citation
 * and status from the file), plus the few extra sources above. Built from the data so a citation is
 * written once.
 */
export const PREDICTED_SOURCES: Record<string, Source> = {
  ...defineSources(
    Object.fromEntries(
      EQUATIONS.map((eq) => [
        eq.id,
        {
          citation: formatCitation(eq),
          status: eq.status,
          doi: eq.source.doi,
          pmid: eq.source.pmid,
          note: `${eq.source.locator}. ${eq.source.seenIn}`,
        },
      ]),
    ) as Record<string, Omit<Source, "id">>,
  ),
  ...EXTRA,
};
