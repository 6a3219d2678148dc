/**
 * Every equation, cut-off and method names its published source. A source is written once, in a
 * registry of its layer (`lib/<layer>/sources.ts`), and referenced by id everywhere else.
 */

/**
 * - confirmed: the number was seen in the primary text or its abstract;
 * - secondary: seen only in a secondary reproduction (review table, later paper);
 * - recalled: from memory, not yet seen in found text: verify before relying on it;
 * - common-practice: a fact of the trade with no single published source;
 * - our-choice: a setting of this software (a window, a tolerance, a way of combining) that no source fixes.
 */
export type EvidenceStatus = "confirmed" | "secondary" | "recalled" | "common-practice" | "our-choice";

/** A status as printed beside a number: "common practice", "our choice" (the others as they are). */
export const EVIDENCE_LABEL: Record<EvidenceStatus, string> = {
  confirmed: "confirmed",
  secondary: "secondary",
  recalled: "recalled",
  "common-practice": "common practice",
  "our-choice": "our choice",
};

export interface Source {
  /** Stable id, kebab-case: `<firstauthor>-<year>[-topic]`, e.g. `beaver-1986`. */
  id: string;
  /** Short citation as shown beside a number, e.g. "Beaver, Wasserman & Whipp 1986, J Appl Physiol 60:2020". */
  citation: string;
  status: EvidenceStatus;
  doi?: string;
  pmid?: string;
  /** What exactly rests on this source and what is still unverified. */
  note?: string;
}

/** Registry helper: checks ids are unique and match their keys (a programming mistake throws). */
export function defineSources<const K extends string>(sources: Record<K, Omit<Source, "id">>): Record<K, Source> {
  const out = {} as Record<K, Source>;
  for (const key of Object.keys(sources) as K[]) {
    out[key] = { id: key, ...sources[key] };
  }
  return out;
}

const STATUS_STRENGTH: Record<EvidenceStatus, number> = {
  confirmed: 3,
  secondary: 2,
  "common-practice": 1,
  "our-choice": 1,
  recalled: 0,
};

/**
 * Merge layer registries. One paper may be registered by several layers for different claims (e.g.
 * an equation seen only in a reproduction, and a cut-off seen in the abstract): the merged entry
 * keeps the fuller citation and the strongest paper-level status, and joins the notes. Each item
 * (equation, rule, method) still carries its own evidence status beside its number.
 */
export function mergeSourceRegistries(...registries: Record<string, Source>[]): Record<string, Source> {
  const merged: Record<string, Source> = {};
  for (const reg of registries) {
    for (const [id, src] of Object.entries(reg)) {
      const prev = merged[id];
      if (!prev) {
        merged[id] = src;
        continue;
      }
      const notes = [prev.note, src.note].filter((n, i, all): n is string => Boolean(n) && all.indexOf(n) === i);
      merged[id] = {
        ...prev,
        citation: src.citation.length > prev.citation.length ? src.citation : prev.citation,
        status: STATUS_STRENGTH[src.status] > STATUS_STRENGTH[prev.status] ? src.status : prev.status,
        doi: prev.doi ?? src.doi,
        pmid: prev.pmid ?? src.pmid,
        note: notes.length > 0 ? notes.join(" ") : undefined,
      };
    }
  }
  return merged;
}
