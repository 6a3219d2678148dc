/**
 * Synthetic tests for the index modules: invented data whose answers are known by construction.
 * Protocol: rest 0-177 s, ramp 180-780 s (20 W/min from 0 W), recovery 783-960 s, one breath every 3 s.
 */
import type { BreathRow, Phase } from "../../lib/breath";
import type { AveragingSpec, ConditionedTest, PhaseSpan } from "../../lib/signal";

export const REST_END_S = 177;
export const EX_START_S = 180;
export const EX_END_S = 780;
export const REC_END_S = 960;
export const STEP_S = 3;

/** Work rate of the invented ramp: 20 W/min from 0 W at 180 s. */
export const rampW = (t: number) => (t - EX_START_S) / 3;

export function phaseAt(t: number): Phase {
  return t <= REST_END_S ? "rest" : t <= EX_END_S ? "exercise" : "recovery";
}

/** Build rows every STEP_S s from 0 to REC_END_S with fields from `f(t, phase)`. */
export function buildRows(f: (t: number, phase: Phase) => Partial<BreathRow>): BreathRow[] {
  const rows: BreathRow[] = [];
  for (let t = 0; t <= REC_END_S; t += STEP_S) {
    const phase = phaseAt(t);
    rows.push({ timeS: t, phase, ...f(t, phase) });
  }
  return rows;
}

const NONE: AveragingSpec = { kind: "none", label: "breath by breath (no averaging)" };

export const PHASES: PhaseSpan[] = [
  { phase: "rest", startS: 0, endS: REST_END_S, source: "markers" },
  { phase: "exercise", startS: EX_START_S, endS: EX_END_S, source: "markers" },
  { phase: "recovery", startS: EX_END_S + STEP_S, endS: REC_END_S, source: "markers" },
];

/** A ConditionedTest around the rows (clean = averaged unless given). */
export function makeTest(rows: BreathRow[], over: Partial<ConditionedTest> = {}): ConditionedTest {
  return {
    shape: "breath",
    clean: rows,
    removed: [],
    averaged: rows,
    averaging: NONE,
    phases: PHASES,
    exercise: { startS: EX_START_S, endS: EX_END_S },
    rampRateWPerMin: 20,
    issues: [],
    ...over,
  };
}

/** Deep-freeze a test so a module that mutates its input fails loudly. */
export function freezeTest(test: ConditionedTest): ConditionedTest {
  for (const r of test.clean) Object.freeze(r);
  for (const r of test.averaged) Object.freeze(r);
  Object.freeze(test.clean);
  Object.freeze(test.averaged);
  for (const p of test.phases) Object.freeze(p);
  Object.freeze(test.phases);
  return Object.freeze(test);
}

/**
 * The standard invented ramp used by several tests:
 * - VO2 = 1000 + 2·(t − 180) mL/min in exercise (500 at rest);
 * - VCO2 = 1.2·VO2 − 300 mL/min (RER rises with VO2);
 * - HR = 60 + 0.2·(t − 180) in exercise (60 at rest), recovery falls 0.2 bpm/s from 180;
 * - work = (t − 180)/3 W;
 * - PETCO2: 36 at rest, tent 36 → 42 (at 480 s) → 36 at 0.02 mmHg/s;
 * - SpO2: 97 at rest, 97 − 0.01·(t − 180) in exercise;
 * - VE = 25·VCO2(L/min) + 3.
 */
export function standardRamp(): ConditionedTest {
  return makeTest(
    buildRows((t, phase) => {
      const ex = phase === "exercise";
      const vo2 = ex ? 1000 + 2 * (t - EX_START_S) : 500;
      const vco2 = 1.2 * vo2 - 300;
      const hr = phase === "rest" ? 60 : ex ? 60 + 0.2 * (t - EX_START_S) : 180 - 0.2 * (t - EX_END_S);
      return {
        vo2MlMin: vo2,
        vco2MlMin: vco2,
        veLMin: 25 * (vco2 / 1000) + 3,
        hrBpm: hr,
        workW: ex ? rampW(t) : 0,
        petco2MmHg: ex ? 42 - 0.02 * Math.abs(t - 480) : 36,
        spo2Pct: ex ? 97 - 0.01 * (t - EX_START_S) : 97,
      };
    }),
  );
}

/**
 * One hour of breaths at 1 breath/s (invented): rest 0–299 s, ramp 300–3300 s with VO2 = 800 + 0.8·(t − 300) mL/min
 * and work (t − 300)/12 W (so ΔVO2/ΔWR = 0.8 ÷ (1/12) = 9.6 mL/min/W by construction), recovery to 3599 s.
 * Shared by the index tests and the index benchmark.
 */
export function oneHourRamp(): ConditionedTest {
  const rows: BreathRow[] = [];
  for (let t = 0; t < 3600; t++) {
    const ex = t >= 300 && t <= 3300;
    const vo2 = ex ? 800 + 0.8 * (t - 300) : 400;
    rows.push({
      timeS: t,
      phase: t < 300 ? "rest" : ex ? "exercise" : "recovery",
      vo2MlMin: vo2,
      vco2MlMin: 0.9 * vo2,
      veLMin: 0.03 * vo2 + 2,
      hrBpm: 60 + vo2 / 30,
      workW: ex ? (t - 300) / 12 : 0,
      petco2MmHg: 38,
      spo2Pct: 97,
    });
  }
  return makeTest(rows, {
    exercise: { startS: 300, endS: 3300 },
    phases: [
      { phase: "rest", startS: 0, endS: 299, source: "markers" },
      { phase: "exercise", startS: 300, endS: 3300, source: "markers" },
      { phase: "recovery", startS: 3301, endS: 3599, source: "markers" },
    ],
  });
}
