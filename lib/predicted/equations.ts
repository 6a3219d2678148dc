import { checkEquationFile, checkEquationSet } from "./checkEquationFile";
import { EQUATION_FILES } from "./equationFiles";
import type { ReferenceEquation } from "./equationSchema";

function loadAll(): readonly ReferenceEquation[] {
  const out: ReferenceEquation[] = [];
  const problems: string[] = [];
  for (const raw of EQUATION_FILES) {
    const check = checkEquationFile(raw);
    problems.push(...check.problems);
    if (check.equation) out.push(Object.freeze(check.equation));
  }
  problems.push(...checkEquationSet(out));
  // A shipped data file that fails its own schema is a programming mistake, not a clinical one.
  if (problems.length > 0) throw new Error(`reference equations failed validation:\n${problems.join("\n")}`);
  return Object.freeze(out);
}

/**
 * Every reference equation shipped in `reference-equations/`, validated (zod schema plus
 * cross-file rules) when this module is first imported.
 */
export const EQUATIONS: readonly ReferenceEquation[] = loadAll();

const BY_ID = new Map(EQUATIONS.map((e) => [e.id, e]));

/** The equation with this id, or `undefined` when there is none. */
export function findEquation(id: string): ReferenceEquation | undefined {
  return BY_ID.get(id);
}

/** The equation with this id; an unknown id is a programming mistake and throws. */
export function getEquation(id: string): ReferenceEquation {
  const eq = BY_ID.get(id);
  if (!eq) throw new Error(`unknown reference equation ${id}`);
  return eq;
}
