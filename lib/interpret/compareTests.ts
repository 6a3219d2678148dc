import { makeIssue, type EvidenceStatus, type Issue } from "../core";
import { formatNumber } from "../units";
import { assessEffort } from "./assessEffort";
import { unique } from "./format";
import { formatValue } from "./format";
import { INTERPRETATION_DATA, type InterpretationData } from "./interpretationData";
import { makeContext } from "./interpret";
import type { VariabilityEntry } from "./schema";
import type { InterpretInput, InterpretSettings } from "./types";
import { variableInfo, type VariableId } from "./variables";

/** Variables compared between two tests (others may be added; noise bands come from variability.json). */
export const SERIAL_VARIABLES: readonly VariableId[] = [
  "peakVo2MlMin",
  "peakVo2MlKgMin",
  "peakVo2PctPred",
  "peakWorkW",
  "vt1Vo2MlMin",
  "vt1Vo2MlKgMin",
  "o2PulsePeakMlBeat",
  "veVco2SlopeWhole",
  "veVco2SlopeToRcp",
  "veVco2Nadir",
  "veVco2AtVt1",
  "oues",
  "dVo2dWr",
  "peakHrBpm",
  "peakRer",
];

export interface NoiseBand {
  entryId: string;
  kind: VariabilityEntry["kind"];
  /** Noise band in the variable's unit; null for ICC-only entries. */
  threshold: number | null;
  /** How the band was obtained, in words (with arithmetic for CoV-based bands). */
  basis: string;
  population: string;
  sourceIds: string[];
  status: EvidenceStatus;
}

export interface SerialItem {
  variable: string;
  label: string;
  unit: string;
  before: number | null;
  after: number | null;
  /** after − before, in the variable's unit. */
  change: number | null;
  changePct: number | null;
  noise: NoiseBand | null;
  verdict: "beyond-noise" | "within-noise" | "not-judged";
  text: string;
}

export interface SerialComparison {
  population: string;
  populationLabel: string;
  items: SerialItem[];
  /** Effort verdict keys of the earlier and later test, with their labels in words (what the page shows). */
  effort: { before: string; after: string; beforeLabel: string; afterLabel: string; comparable: boolean };
  issues: Issue[];
  sourceIds: string[];
}

const SDC_FACTOR = 1.96 * Math.SQRT2; // standard statistics: SDC = 1.96·√2·SEM (source sdc-statistics)

function noiseBand(e: VariabilityEntry, before: number, after: number): NoiseBand {
  const mean = (before + after) / 2;
  const common = { entryId: e.id, kind: e.kind, population: e.populationLabel, sourceIds: e.sourceIds, status: e.status };
  switch (e.kind) {
    case "absolute":
      return { ...common, threshold: e.value, basis: `${e.description} (${e.populationLabel})` };
    case "cov-pct": {
      const sem = (e.value / 100) * mean;
      const threshold = SDC_FACTOR * sem;
      return {
        ...common,
        threshold,
        basis: `smallest detectable change 1.96 × √2 × SEM, SEM = CoV ${e.value} % × mean ${mean.toPrecision(4)} = ${sem.toPrecision(3)}, so ${threshold.toPrecision(3)} (${e.description}; ${e.populationLabel}; SDC formula is standard statistics)`,
      };
    }
    case "repeatability-pct": {
      const threshold = (e.value / 100) * mean;
      return {
        ...common,
        threshold,
        basis: `coefficient of repeatability ${e.value} % × mean ${mean.toPrecision(4)} = ${threshold.toPrecision(3)} (${e.description}; ${e.populationLabel})`,
      };
    }
    case "icc":
      return {
        ...common,
        threshold: null,
        basis: `${e.description} (${e.populationLabel}); an ICC gives no noise band without the study's SD`,
      };
  }
}

/**
 * Serial comparison of two tests (e.g. before and after training or prehabilitation): per key value the
 * change and whether it exceeds the published test–retest variability for that population
 * (variability.json: Bensimhon 2008 HF; Decato 2018 and Van Laethem 2009 healthy; Barron 2014 and
 * Coeckelberghs 2016 ICCs). A change is "beyond measurement noise" only when it exceeds that band;
 * with no band for the population it is "not-judged". Effort-dependent values are not judged when
 * either test was not shown to be maximal.
 */
export function compareTests(
  before: InterpretInput,
  after: InterpretInput,
  population: string,
  settings: InterpretSettings = {},
  data: InterpretationData = INTERPRETATION_DATA,
): SerialComparison {
  const issues: Issue[] = [];
  const pop = data.variability.populations.find((p) => p.id === population);
  if (!pop) {
    issues.push(
      makeIssue(
        "warning",
        "unknown-variability-population",
        `No published test-retest data for population "${population}"; changes are shown but not judged.`,
        {
          field: "population",
        },
      ),
    );
  }
  const a = makeContext(before, settings, data).ctx;
  const b = makeContext(after, settings, data).ctx;
  const effortA = assessEffort(a);
  const effortB = assessEffort(b);
  const comparable = effortA.peakConclusionsAllowed && effortB.peakConclusionsAllowed;
  if (!comparable) {
    issues.push(
      makeIssue(
        "warning",
        "serial-effort-not-comparable",
        "Maximal effort was not shown in both tests: changes in peak values are not judged.",
      ),
    );
  }
  // a % of predicted is only comparable between tests when the same equation made both predictions
  const otherEquation = (variable: VariableId): [string, string] | null => {
    if (!variableInfo(variable).unit.startsWith("%")) return null; // a measured value does not depend on the equation
    const q = variableInfo(variable).predictedKey as keyof NonNullable<InterpretInput["predictedEquations"]> | undefined;
    const [e1, e2] = q ? [before.predictedEquations?.[q], after.predictedEquations?.[q]] : [undefined, undefined];
    return e1 && e2 && e1 !== e2 ? [e1, e2] : null;
  };
  for (const variable of SERIAL_VARIABLES) {
    const pair = otherEquation(variable);
    if (pair)
      issues.push(
        makeIssue(
          "warning",
          "serial-different-equations",
          `${variableInfo(variable).label}: the two tests were predicted by different equations (${pair[0]} before, ${pair[1]} after), so the change is not judged; compare the measured values, or analyse both tests with one equation.`,
        ),
      );
  }
  const items = SERIAL_VARIABLES.map((variable): SerialItem => {
    const info = variableInfo(variable);
    const num = (v: unknown) => (typeof v === "number" && Number.isFinite(v) ? v : null);
    const x = num(a.vars[variable]);
    const y = num(b.vars[variable]);
    const change = x !== null && y !== null ? y - x : null;
    // a change of a percentage is given in percentage points, never as a percentage of a percentage
    const points = info.unit.startsWith("%");
    const changePct = change !== null && x !== 0 && x !== null && !points ? (100 * change) / x : null;
    const base = { variable, label: info.label, unit: info.unit, before: x, after: y, change, changePct };
    const fmt = (v: number | null) => `${formatValue(variable, v)}${info.unit ? ` ${info.unit}` : ""}`;
    const head = `${info.label}: ${fmt(x)} → ${fmt(y)}`;
    if (change === null) return { ...base, noise: null, verdict: "not-judged", text: `${head}: change not available` };
    const signed = `${change >= 0 ? "+" : ""}${formatValue(variable, change)}${points ? " percentage points" : info.unit ? ` ${info.unit}` : ""}`;
    const pair = otherEquation(variable);
    if (pair)
      return {
        ...base,
        noise: null,
        verdict: "not-judged",
        text: `${head} (${signed}): not judged, predicted by different equations (${pair[0]} before, ${pair[1]} after)`,
      };
    // heart rate and O2 pulse (VO2/HR) are not compared across a rhythm or a beta-blocker that differs: atrial
    // fibrillation's rate is not set by the sinus node, and a beta-blocker started or stopped lowers or raises heart
    // rate, and O2 pulse with it
    const afIn = [before, after].map((t, i) => (t.patient.atrialFibrillation === true ? (i === 0 ? "before" : "after") : ""));
    const bb = [before, after].map((t) => t.patient.betaBlocker === true);
    const hrNotComparable = afIn.some(Boolean)
      ? `atrial fibrillation recorded ${afIn.filter(Boolean).join(" and ")}`
      : bb[0] !== bb[1]
        ? `a beta-blocker is recorded ${bb[0] ? "before" : "after"} only`
        : null;
    if ((variable === "peakHrBpm" || variable === "o2PulsePeakMlBeat") && hrNotComparable)
      return { ...base, noise: null, verdict: "not-judged", text: `${head} (${signed}): not judged, ${hrNotComparable}` };
    if (info.effortDependent && !comparable) {
      return {
        ...base,
        noise: null,
        verdict: "not-judged",
        text: `${head} (${signed}): not judged, maximal effort not shown in both tests`,
      };
    }
    const entries = data.variability.entries.filter((e) => e.variable === variable && e.population === population);
    const withBand = entries.find((e) => e.kind !== "icc");
    const entry = withBand ?? entries[0];
    if (!entry)
      return {
        ...base,
        noise: null,
        verdict: "not-judged",
        text: `${head} (${signed}): not judged, this software holds no test-retest variability for this population`,
      };
    const noise = noiseBand(entry, x!, y!);
    if (noise.threshold === null)
      return { ...base, noise, verdict: "not-judged", text: `${head} (${signed}): not judged; ${noise.basis}` };
    // a per-kg value also moves with body weight; the retest studies held weight constant, so a per-kg change across a
    // weight change (more than 2 %, our choice) is judged at the earlier weight: the later VO2 over the earlier weight
    const [wA, wB] = [before.patient.weightKg, after.patient.weightKg];
    const perKg = info.unit.includes("/kg");
    const weightMoved = perKg && typeof wA === "number" && typeof wB === "number" && wA > 0 && Math.abs(wB - wA) / wA > 0.02;
    const judged = weightMoved ? y! * (wB! / wA!) - x! : change;
    const unitText = info.unit ? ` ${info.unit}` : "";
    const atWeight = weightMoved
      ? `; body weight ${formatNumber(wA!, 1)} → ${formatNumber(wB!, 1)} kg, so it is judged at the earlier weight, where the change is ${judged >= 0 ? "+" : ""}${formatValue(variable, judged)}${unitText}`
      : "";
    const beyond = Math.abs(judged) > noise.threshold;
    const band = `${formatValue(variable, noise.threshold)}${unitText}`;
    // a change that rounds to the band's own value is given to two more decimals, so "beyond" is seen to be beyond
    const edge =
      formatValue(variable, Math.abs(judged)) === formatValue(variable, noise.threshold)
        ? `; unrounded ${Math.abs(judged).toFixed(3)} ${beyond ? ">" : "≤"} ${noise.threshold.toFixed(3)}`
        : "";
    return {
      ...base,
      noise,
      verdict: beyond ? "beyond-noise" : "within-noise",
      text: `${head} (${signed}${atWeight}): ${beyond ? "beyond measurement noise" : "within measurement noise"} (band ±${band}${edge}; ${noise.basis})`,
    };
  });
  return {
    population,
    populationLabel: pop?.label ?? population,
    items,
    effort: {
      before: effortA.verdict,
      after: effortB.verdict,
      beforeLabel: effortA.label,
      afterLabel: effortB.label,
      comparable,
    },
    issues,
    sourceIds: unique(items.flatMap((i) => i.noise?.sourceIds ?? [])),
  };
}
