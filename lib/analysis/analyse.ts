import { measured, notDetermined, type Issue } from "../core";
import { conditionTable } from "../signal";
import { peakOverWindow } from "../thresholds";
import type { AnalysisResult, AnalysisSettings, TestRecord } from "./types";

export const ENGINE_VERSION = "0.1.0";

/**
 * The whole analysis as one pure, deterministic function of (record, settings).
 * Everything shown anywhere (page, PDF, CLI JSON) is derived from its result.
 */
export function analyse(record: TestRecord, settings: AnalysisSettings = {}): AnalysisResult {
  const issues: Issue[] = [...record.importIssues];
  const test = conditionTable(record.table, { averaging: settings.averaging });
  issues.push(...test.issues);
  const rows = test.clean;
  const first = rows[0]?.timeS ?? 0;
  const last = rows[rows.length - 1]?.timeS ?? 0;
  const durationS = measured(last - first, "s", {
    method: "record-span",
    label: "time from first to last row",
    sourceIds: ["common-practice"],
    window: { startS: first, endS: last },
  });
  const vo2MlMin = peakOverWindow(rows, "vo2MlMin", { unit: "mL/min", windowS: settings.peakWindowS ?? 30 });
  const weightKg = record.patient.weightKg;
  const vo2MlKgMin =
    vo2MlMin.value !== null && weightKg
      ? measured(vo2MlMin.value / weightKg, "mL/kg/min", {
          ...vo2MlMin.provenance,
          inputs: { ...vo2MlMin.provenance.inputs, weightKg },
        })
      : notDetermined(
          "mL/kg/min",
          vo2MlMin.provenance,
          weightKg ? (vo2MlMin.reason ?? "peak VO2 not determinable") : "body weight not given",
        );
  return {
    engineVersion: ENGINE_VERSION,
    durationS,
    peak: { vo2MlMin, vo2MlKgMin },
    conditioned: {
      exercise: test.exercise,
      phases: test.phases,
      averaging: test.averaging,
      rampRateWPerMin: test.rampRateWPerMin,
      removed: test.removed,
    },
    issues,
  };
}
