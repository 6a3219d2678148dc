import { makeIssue, measured, notDetermined, type Issue, type Measured } from "../core";
import type { ConditionedTest } from "../signal";
import { exerciseSpan, fieldSeries, provenanceOf, restSpan, rollingExtreme, WindowMeans } from "./indexSeries";

/** Published definitions of exercise desaturation (clinical-reference §2; they differ). */
export type DesaturationDefinitionId = "hadeli-2001" | "respiration-2012" | "andrianopoulos-2014";

export interface DesaturationDefinition {
  id: DesaturationDefinitionId;
  label: string;
  sourceId: string;
  test: (restPct: number | null, lowestPct: number | null) => boolean | null;
}

/** Desaturation definitions, boundaries exactly as published. */
export const DESATURATION_DEFINITIONS: Record<DesaturationDefinitionId, DesaturationDefinition> = {
  "hadeli-2001": {
    id: "hadeli-2001",
    label: "SpO2 fall ≥ 4% from rest",
    sourceId: "hadeli-2001",
    test: (rest, low) => (rest === null || low === null ? null : rest - low >= 4),
  },
  "respiration-2012": {
    id: "respiration-2012",
    label: "SpO2 fall > 4% to below 90%",
    sourceId: "respiration-2012-desaturation",
    test: (rest, low) => (rest === null || low === null ? null : rest - low > 4 && low < 90),
  },
  "andrianopoulos-2014": {
    id: "andrianopoulos-2014",
    label: "SpO2 nadir ≤ 88%",
    sourceId: "andrianopoulos-2014",
    test: (_rest, low) => (low === null ? null : low <= 88),
  },
};

export interface Spo2Options {
  /** Window for the lowest SpO2, seconds. @default 30 */
  windowS?: number;
  /** Resting SpO2 = mean of the last `restLastS` s of rest. @default 60 */
  restLastS?: number;
  /** Definition reported as the headline. @default "hadeli-2001" */
  definition?: DesaturationDefinitionId;
}

export interface Spo2Result {
  restPct: Measured;
  lowestPct: Measured;
  /** Rest minus lowest, percentage points. */
  fallPct: Measured;
  /** Headline definition and its verdict. */
  definition: DesaturationDefinitionId;
  desaturation: boolean | null;
  /** Every definition's verdict, so disagreements are visible. */
  byDefinition: { id: DesaturationDefinitionId; label: string; sourceId: string; met: boolean | null }[];
  issues: Issue[];
}

/**
 * SpO2 at rest (mean of the last minute of rest), lowest (lowest `windowS`-s rolling mean in exercise) and
 * the fall between them; desaturation by three published definitions: fall ≥ 4% (Hadeli 2001, confirmed),
 * fall > 4% to < 90% (Respiration 2012, confirmed), nadir ≤ 88% (Andrianopoulos 2014, confirmed).
 */
export function spo2(test: ConditionedTest, options: Spo2Options = {}): Spo2Result {
  const windowS = options.windowS ?? 30;
  const restLastS = options.restLastS ?? 60;
  const definition = options.definition ?? "hadeli-2001";
  const issues: Issue[] = [];
  const rest = restSpan(test, restLastS);
  const all = fieldSeries(test.clean, "spo2Pct");
  const restProv = provenanceOf("rest-mean", `resting SpO2: mean of the last ${restLastS} s of rest`, ["implementation-choice"], {
    window: rest ?? undefined,
  });
  const restV = rest ? new WindowMeans(all).mean(rest.startS, rest.endS).mean : NaN;
  const restPct = Number.isFinite(restV)
    ? measured(restV, "%", restProv)
    : notDetermined("%", restProv, rest ? "no SpO2 at rest" : "no rest phase marked");
  const span = exerciseSpan(test);
  const ex = fieldSeries(test.clean, "spo2Pct", span);
  const lowProv = provenanceOf(
    `lowest-rolling-${windowS}s`,
    `lowest SpO2: lowest ${windowS}-s rolling mean in exercise`,
    ["implementation-choice"],
    {
      averaging: `${windowS}-s rolling time window over breaths`,
    },
  );
  const m = new WindowMeans(ex);
  const best = span
    ? rollingExtreme(ex.t, test.shape === "stage" ? 0 : windowS, span.startS, (a, b) => m.mean(a, b).mean, "min")
    : null;
  const lowestPct = best
    ? measured(best.value, "%", { ...lowProv, window: { startS: best.startS, endS: best.endS } })
    : notDetermined("%", lowProv, "no SpO2 in exercise");
  const fallProv = provenanceOf("spo2-fall", "SpO2 fall = resting − lowest", ["hadeli-2001"], {
    inputs: { restPct: restPct.value, lowestPct: lowestPct.value },
  });
  const fallPct =
    restPct.value !== null && lowestPct.value !== null
      ? measured(restPct.value - lowestPct.value, "%", fallProv)
      : notDetermined("%", fallProv, restPct.reason ?? lowestPct.reason ?? "not determinable");
  const byDefinition = Object.values(DESATURATION_DEFINITIONS).map((d) => ({
    id: d.id,
    label: d.label,
    sourceId: d.sourceId,
    met: d.test(restPct.value, lowestPct.value),
  }));
  if (ex.v.length === 0) issues.push(makeIssue("info", "no-spo2", "No SpO2 signal in exercise: desaturation not assessable."));
  return {
    restPct,
    lowestPct,
    fallPct,
    definition,
    desaturation: byDefinition.find((d) => d.id === definition)?.met ?? null,
    byDefinition,
    issues,
  };
}
