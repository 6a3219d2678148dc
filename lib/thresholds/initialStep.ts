import { fieldSeries, WindowMeans } from "./indexSeries";
import type { ConditionedTest } from "../signal";

export interface InitialStep {
  /** VO2 rise from the 30 s before the incremental phase to its 60–90-s window, mL/min. */
  jumpMlMin: number;
  /** What the ramp's own mean rate (from 60 s to the end) would add over those 75 s, mL/min. */
  rampWouldAddMlMin: number;
  /** jump ÷ ramp share: about 1 on a ramp that follows unloaded pedalling. */
  ratio: number;
}

/**
 * How big a step the incremental phase starts with, read from VO2: the rise from the 30 s before its start to its
 * 60–90-s window, against what the ramp's own mean rate (from 60 s to the end) adds over the same 75 s. About 1 after
 * unloaded pedalling; far above 1 when the exercise starts from rest or with a jump in load (a treadmill going from
 * walking to running, a first stage at a high load). The ERS statement asks for about 3 minutes of unloaded exercise
 * before the ramp (Radtke et al. 2019, confirmed); after a large step the CO2 stores take minutes to fill, so the
 * VCO2-against-VO2 relation is not yet the metabolic one (Beaver, Wasserman & Whipp 1986 leave the early data out for
 * that reason — recalled detail). Null when there is no incremental phase, no data before it, or it is under 3 minutes.
 */
export function initialStep(test: ConditionedTest): InitialStep | null {
  const ex = test.exercise;
  if (!ex || ex.endS - ex.startS < 180) return null;
  const m = new WindowMeans(fieldSeries(test.clean, "vo2MlMin"));
  const before = m.mean(ex.startS - 30, ex.startS - 1e-6); // the 30 s before the start, not its first breath
  const early = m.mean(ex.startS + 60, ex.startS + 90);
  const late = m.mean(ex.endS - 30, ex.endS);
  if (before.count < 2 || early.count < 2 || late.count < 2) return null;
  // mean ramp rate between the early window's centre (start + 75 s) and the late window's (end − 15 s), per second
  const rate = (late.mean - early.mean) / (ex.endS - 15 - (ex.startS + 75));
  const rampWouldAddMlMin = rate * 75;
  const jumpMlMin = early.mean - before.mean;
  if (!(rampWouldAddMlMin > 0)) return null;
  return { jumpMlMin, rampWouldAddMlMin, ratio: jumpMlMin / rampWouldAddMlMin };
}
