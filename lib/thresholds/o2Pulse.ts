import { makeIssue, measured, notDetermined, type Issue, type Measured } from "../core";
import { linearRegression } from "../numeric/linearRegression";
import type { ConditionedTest } from "../signal";
import { channelGaps, describeChannelGap, type ChannelGap } from "./channelGaps";
import { exerciseSpan, fieldSeries, provenanceOf, WindowMeans } from "./indexSeries";

export interface O2PulseOptions {
  /** Bin width of the trajectory, seconds. @default 30 */
  binS?: number;
  /** Final fraction of exercise judged for a plateau or fall. @default 1/3 */
  finalFraction?: number;
  /** "flat" when the final slope lies within ± this fraction of the earlier slope; below that band "falling" (implementation choice). @default 0.25 */
  flatFraction?: number;
}

export interface O2PulsePoint {
  /** Bin centre, s. */
  timeS: number;
  o2PulseMlBeat: number;
}

export interface O2PulseResult {
  trajectory: O2PulsePoint[];
  /** OLS slope of O2 pulse on time over the final part of exercise, mL/beat per min. */
  finalSlope: Measured;
  /** OLS slope over the earlier part, mL/beat per min. */
  earlierSlope: Measured;
  /** rising / flat / falling in the final part; null when not determinable. */
  pattern: "rising" | "flat" | "falling" | null;
  /** Why `pattern` is null (null when it is given). */
  patternReason: string | null;
  issues: Issue[];
}

/**
 * O2 pulse trajectory (VO2/HR, mL/beat; definition confirmed) as the ratio of VO2 and HR means in
 * consecutive `binS`-s bins over exercise, and a plateau/fall flag for the final third of exercise:
 * flat when the final slope lies within ±`flatFraction` of the earlier slope, falling below that band,
 * rising above it. The flag's arithmetic is an implementation choice; the clinical pattern "O2 pulse flat" is
 * from the CCJM patterns table (secondary).
 *
 * Degenerate cases: fewer than 2 bins in either part → not determinable. HR missing for 30 s or more of exercise
 * while gas exchange continues (`channelGaps`, CHANNEL_GAP_MIN_S) → the bins touching the gap are left out, the slope
 * of each part the gap touches is not determinable and the pattern is not assessed: both parts are read (the earlier
 * slope sets the band the final slope is judged against), and a bin holding VO2 over its whole width but HR over only
 * part of it gives a ratio that is not an O2 pulse.
 */
export function o2Pulse(test: ConditionedTest, options: O2PulseOptions = {}): O2PulseResult {
  const binS = options.binS ?? 30;
  const finalFraction = options.finalFraction ?? 1 / 3;
  const flatFraction = options.flatFraction ?? 0.25;
  const issues: Issue[] = [];
  const span = exerciseSpan(test);
  const gaps = channelGaps(test, "hrBpm");
  const touchesGap = (a: number, b: number) => gaps.some((g) => a < g.endS && b > g.startS);
  const trajectory: O2PulsePoint[] = [];
  if (span) {
    const vo2 = new WindowMeans(fieldSeries(test.clean, "vo2MlMin", span));
    const hr = new WindowMeans(fieldSeries(test.clean, "hrBpm", span));
    const stage = test.shape === "stage";
    if (stage) {
      for (const r of test.clean) {
        if (r.timeS < span.startS || r.timeS > span.endS) continue;
        if (typeof r.vo2MlMin === "number" && typeof r.hrBpm === "number" && r.hrBpm > 0)
          trajectory.push({ timeS: r.timeS, o2PulseMlBeat: r.vo2MlMin / r.hrBpm });
      }
    } else {
      for (let a = span.startS; a + binS <= span.endS + 1e-9; a += binS) {
        const b = a + binS - 1e-9;
        if (touchesGap(a, b)) continue;
        const v = vo2.mean(a, b).mean / hr.mean(a, b).mean;
        if (Number.isFinite(v)) trajectory.push({ timeS: a + binS / 2, o2PulseMlBeat: v });
      }
    }
  }
  const cut = span ? span.endS - finalFraction * (span.endS - span.startS) : 0;
  const early = trajectory.filter((p) => p.timeS < cut);
  const late = trajectory.filter((p) => p.timeS >= cut);
  const gapIn = (a: number, b: number): ChannelGap | undefined => gaps.find((g) => a < g.endS && b > g.startS);
  const gapReason = (g: ChannelGap) => `${describeChannelGap(g)}: the O2 pulse trajectory is not assessed across a gap in HR`;
  const slopeOf = (pts: O2PulsePoint[], which: string, partStartS: number, partEndS: number): Measured => {
    const prov = provenanceOf(
      `o2-pulse-slope-${which}`,
      `O2 pulse vs time, OLS slope over the ${which} part of exercise`,
      ["o2-pulse-definition", "implementation-choice"],
      {
        window: pts.length > 0 ? { startS: pts[0].timeS, endS: pts[pts.length - 1].timeS } : undefined,
        averaging: `${binS}-s bins`,
        inputs: { bins: pts.length },
      },
    );
    const gap = span ? gapIn(partStartS, partEndS) : undefined;
    if (gap) return notDetermined("mL/beat/min", prov, gapReason(gap));
    if (pts.length < 2) return notDetermined("mL/beat/min", prov, `fewer than 2 bins in the ${which} part`);
    const f = linearRegression(
      pts.map((p) => p.timeS / 60),
      pts.map((p) => p.o2PulseMlBeat),
    );
    return measured(f.slope, "mL/beat/min", prov);
  };
  const finalSlope = slopeOf(late, "final", cut, span?.endS ?? 0);
  const earlierSlope = slopeOf(early, "earlier", span?.startS ?? 0, cut);
  let pattern: O2PulseResult["pattern"] = null;
  let patternReason: string | null = null;
  const firstGap = span ? gapIn(span.startS, span.endS) : undefined;
  if (firstGap) {
    patternReason = gapReason(firstGap);
    issues.push(
      makeIssue("info", "o2-pulse-pattern-not-assessed", `O2 pulse pattern: ${patternReason}.`, {
        field: "hrBpm",
        timeS: Math.round(firstGap.startS),
      }),
    );
  } else if (finalSlope.value === null || earlierSlope.value === null) {
    patternReason = finalSlope.reason ?? earlierSlope.reason ?? "O2 pulse slopes not determinable";
  } else {
    const band = flatFraction * Math.max(0, earlierSlope.value);
    if (finalSlope.value < -band) pattern = "falling";
    else if (finalSlope.value <= band) pattern = "flat";
    else pattern = "rising";
  }
  if (trajectory.length === 0)
    issues.push(
      makeIssue("info", "no-o2-pulse", "No bins with both VO2 and HR in exercise: O2 pulse trajectory not determinable."),
    );
  return { trajectory, finalSlope, earlierSlope, pattern, patternReason, issues };
}
