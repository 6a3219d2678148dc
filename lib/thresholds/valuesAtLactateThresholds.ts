import { notDetermined, type Measured } from "../core";
import type { ConditionedTest } from "../signal";
import { fieldSeries, provenanceOf } from "./indexSeries";
import type { LactateThresholdsResult } from "./lactateThresholds";
import { readAtTime, type ReadAtTimeOptions } from "./valuesAtThreshold";

/**
 * The time in exercise at which the work rate (or speed) first reached `x`: linear interpolation between the two rows
 * that bracket it (the first row at or above `x` and the one before); the first exercise row when that already reaches
 * it. NaN when exercise never reached it. On stage rows this places a threshold between two stage ends in proportion to
 * its load, so the heart rate read there is the stage values interpolated by load.
 */
export function timeAtIntensity(test: ConditionedTest, axis: "workW" | "speedKmh", x: number): number {
  const s = fieldSeries(test.clean, axis, test.exercise ?? null);
  for (let i = 0; i < s.t.length; i++) {
    if (!(s.v[i] >= x)) continue;
    if (i === 0 || !(s.v[i - 1] < x)) return s.t[i];
    const f = (x - s.v[i - 1]) / (s.v[i] - s.v[i - 1]);
    return s.t[i - 1] + f * (s.t[i] - s.t[i - 1]);
  }
  return NaN;
}

/**
 * Heart rate and VO2 at each lactate threshold, read as VT1/VT2 values are (`readAtTime`: interpolation in averaged rows,
 * a centred window over breaths) at the time the test first reached the threshold's work rate or speed
 * (`timeAtIntensity`); on stage rows by linear interpolation between the stage values. Common practice: lactate thresholds are used to prescribe training by heart rate (Faude,
 * Kindermann & Meyer, Sports Med 2009 — recalled for this point). Sets `hrBpm` and `vo2MlMin` on each threshold in place; a threshold
 * that is not determinable, or an intensity the test never reached, gets "not determinable" with the reason.
 */
export function valuesAtLactateThresholds(
  test: ConditionedTest,
  lactate: LactateThresholdsResult,
  options: ReadAtTimeOptions = {},
): void {
  // stage rows lie a stage apart: read between them by linear interpolation, as `readAtTime` does on averaged rows
  const mode = options.mode ?? (test.shape === "stage" ? "interpolate" : "auto");
  for (const th of lactate.thresholds) {
    const x = th.intensity.value;
    const prov = provenanceOf(`${th.id}-time`, "read at the time the test reached the threshold's intensity", [
      "common-practice",
    ]);
    if (x === null) {
      const why = th.intensity.reason ?? "the threshold is not determinable";
      th.hrBpm = notDetermined("1/min", prov, why);
      th.vo2MlMin = notDetermined("mL/min", prov, why);
      continue;
    }
    const t = timeAtIntensity(test, lactate.axis, x);
    if (!Number.isFinite(t)) {
      const why = `the test's ${lactate.axis === "workW" ? "work rate" : "speed"} never reached the threshold's in exercise`;
      th.hrBpm = notDetermined("1/min", prov, why);
      th.vo2MlMin = notDetermined("mL/min", prov, why);
      continue;
    }
    const read = (field: "hrBpm" | "vo2MlMin", unit: string): Measured => {
      const m = readAtTime(test, field, t, unit, { mode, windowS: options.windowS });
      return { ...m, provenance: { ...m.provenance, inputs: { ...m.provenance.inputs, thresholdIntensity: x } } };
    };
    th.hrBpm = read("hrBpm", "1/min");
    th.vo2MlMin = read("vo2MlMin", "mL/min");
  }
}
