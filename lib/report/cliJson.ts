import type { Issue } from "../core";
import type { AnalysisResult } from "../analysis";

/**
 * The CLI's JSON object: a stable projection of the analysis result. Keys documented by
 * `cli/analyse.schema.json`; keep them stable (later versions only add keys).
 */
export interface CliAnalysisJson {
  engineVersion: string;
  durationS: number | null;
  peak: { vo2MlMin: number | null; vo2MlKgMin: number | null; method: string };
  issues: Issue[];
}

export function toCliJson(result: AnalysisResult): CliAnalysisJson {
  return {
    engineVersion: result.engineVersion,
    durationS: result.durationS.value,
    peak: {
      vo2MlMin: result.peak.vo2MlMin.value,
      vo2MlKgMin: result.peak.vo2MlKgMin.value,
      method: result.peak.vo2MlMin.provenance.label,
    },
    issues: result.issues,
  };
}
