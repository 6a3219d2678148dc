import type { Issue } from "../core";
import type { BreathTable } from "../breath";
import type { AveragingSpec, ConditionedTest, PhaseSpan } from "./types";

export interface ConditioningSettings {
  /** @default { kind: "none", label: "breath by breath (no averaging)" } */
  averaging?: AveragingSpec;
}

/**
 * Condition an imported table: artefact rejection, averaging, phases.
 * First version: no artefact rejection or averaging; phases from the `phase` markers when present,
 * otherwise the whole record counts as exercise.
 */
export function conditionTable(table: BreathTable, settings: ConditioningSettings = {}): ConditionedTest {
  const issues: Issue[] = [];
  const rows = table.rows;
  const averaging = settings.averaging ?? { kind: "none", label: "breath by breath (no averaging)" };
  const phases: PhaseSpan[] = [];
  for (const r of rows) {
    if (!r.phase) continue;
    const last = phases[phases.length - 1];
    if (last && last.phase === r.phase) last.endS = r.timeS;
    else phases.push({ phase: r.phase, startS: r.timeS, endS: r.timeS, source: "markers" });
  }
  const ex = phases.filter((p) => p.phase === "exercise");
  const exercise =
    ex.length > 0
      ? { startS: ex[0].startS, endS: ex[ex.length - 1].endS }
      : rows.length > 0
        ? { startS: rows[0].timeS, endS: rows[rows.length - 1].timeS }
        : null;
  return { shape: table.shape, clean: rows, removed: [], averaged: rows, averaging, phases, exercise, rampRateWPerMin: null, issues };
}
