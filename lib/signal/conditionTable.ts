import { AVERAGED_ROW_INTERVAL_S, medianRowIntervalS } from "./rowSpacing";
import type { BreathTable } from "../breath";
import { averageSeries, averagingLabel } from "./averageSeries";
import { detectPhases, type PhaseOptions } from "./detectPhases";
import { DEFAULT_ARTEFACT_RULE, DEFAULT_RER_LIMITS, rejectArtefacts } from "./rejectArtefacts";
import { findVo2Fall, vo2FallIssue } from "./vo2Falls";
import type { ArtefactRule, AveragingSpec, SetAsideSpan, ConditionedTest, ConditioningRecord } from "./types";

/** Conditioning settings: plain data, stored with the analysis so the result can be reproduced. */
export interface ConditioningSettings {
  /** @default { kind: "none", label: "breath by breath (no averaging)" } */
  averaging?: AveragingSpec;
  /** Local-deviation artefact rule. @default k 4, 5 breaths each side, VO2/VCO2/VE, local mean */
  artefacts?: Partial<ArtefactRule>;
  /** RER screen. @default { min: 0.5, max: 2 } */
  rer?: { min: number; max: number };
  /** Spans a reviewer set aside (a leak, a run of coughs, an ECG artefact); their channel's values are not used. @default [] */
  setAside?: SetAsideSpan[];
  phases?: PhaseOptions;
}

/**
 * Condition an imported table: artefact-breath rejection (`rejectArtefacts`), averaging
 * (`averageSeries`) and phases with the ramp rate (`detectPhases`, on the clean, unaveraged breaths), then a check for
 * a sustained fall of VO2 in exercise (`findVo2Fall`, warning `vo2-falls-in-exercise`).
 * Stage tables skip the local-deviation rule (stage means are not breaths) and are not averaged.
 * The settings used are returned in `settings`. The input table is not mutated.
 */
export function conditionTable(table: BreathTable, settings: ConditioningSettings = {}): ConditionedTest {
  const requested = settings.averaging ?? { kind: "none", label: averagingLabel({ kind: "none" }) };
  // rows the cart exported as time averages are not breaths: the label says what the rows are, not "breath by breath"
  const rowIntervalS = medianRowIntervalS(table.rows.map((r) => r.timeS));
  const averaging: AveragingSpec =
    table.shape === "stage"
      ? { kind: "none", label: "stage values (no averaging)" }
      : requested.kind === "none" && rowIntervalS >= AVERAGED_ROW_INTERVAL_S
        ? { ...requested, label: `rows as exported: about ${Math.round(rowIntervalS)}-s time averages (no further averaging)` }
        : { ...requested, label: requested.label || averagingLabel(requested) };
  const record: ConditioningRecord = {
    averaging,
    artefacts: { ...DEFAULT_ARTEFACT_RULE, ...settings.artefacts },
    rer: settings.rer ?? { ...DEFAULT_RER_LIMITS },
    ...(settings.setAside?.length ? { setAside: settings.setAside.map((s) => ({ ...s })) } : {}),
  };
  const art = rejectArtefacts(table.rows, {
    rule: record.artefacts,
    rer: record.rer,
    stageRows: table.shape === "stage",
    setAside: record.setAside,
  });
  const averaged = averageSeries(art.clean, averaging);
  const ph = detectPhases(art.clean, settings.phases);
  // a sustained fall of VO2 at a held or rising load: a finding or a fault to check (vo2Falls.ts)
  const fall = table.shape !== "stage" && ph.exercise ? findVo2Fall(art.clean, ph.exercise) : null;
  return {
    shape: table.shape,
    clean: art.clean,
    removed: art.removed,
    averaged,
    averaging,
    phases: ph.phases,
    exercise: ph.exercise,
    rampRateWPerMin: ph.rampRateWPerMin,
    rampRateR2: ph.rampRateR2,
    issues: [...art.issues, ...ph.issues, ...(fall ? [vo2FallIssue(fall)] : [])],
    vo2Fall: fall,
    settings: record,
  };
}
