import type { BreathRow } from "../breath";
import type { AnalysisResult } from "../analysis";
import { averageSeries } from "../signal";
import { LACTATE_METHOD_NAMES, slopeToVt2Name } from "../thresholds";
import { formatNumber } from "../units";
import type { ChartSpec } from "./charts";
import { endTidalChart, lactateChart, timeCourseChart, veVsVco2Chart, ventilatoryEquivalentsChart, vSlopeChart } from "./charts";

const col = (rows: readonly BreathRow[], f: keyof BreathRow) =>
  rows.map((r) => (typeof r[f] === "number" ? (r[f] as number) : null));

/**
 * The standard charts of one analysis, built once from the result and drawn by the one SVG
 * renderer on the page and in the PDF. Display data are 10-s time bins of the cleaned breaths
 * (display only: measurements use their own named windows).
 */
export function analysisCharts(result: AnalysisResult): ChartSpec[] {
  const test = result.conditioned;
  const rows =
    test.shape === "breath" ? averageSeries(test.clean, { kind: "time-bin", seconds: 10, label: "10-s bins" }) : test.clean;
  const ex = test.exercise;
  const exRows = ex ? rows.filter((r) => r.timeS >= ex.startS && r.timeS <= ex.endS) : rows;
  const vt1 = result.thresholds.vt1;
  const vt2 = result.thresholds.vt2;
  const time = col(rows, "timeS");
  // a threshold a reviewer set is labelled so on every chart (never read as the automatic estimate)
  const setByReviewer = { vt1: vt1.overridden !== undefined, vt2: vt2.overridden !== undefined };
  const ratio = (a: keyof BreathRow, b: keyof BreathRow, scale: number) =>
    rows.map((r) =>
      typeof r[a] === "number" && typeof r[b] === "number" && (r[b] as number) > 0
        ? ((r[a] as number) * scale) / (r[b] as number)
        : null,
    );
  const charts: ChartSpec[] = [
    timeCourseChart({
      timeS: time,
      vo2MlMin: col(rows, "vo2MlMin"),
      vco2MlMin: col(rows, "vco2MlMin"),
      hrBpm: col(rows, "hrBpm"),
      workW: col(rows, "workW"),
      vt1TimeS: vt1.timeS,
      vt2TimeS: vt2.timeS,
      setByReviewer,
      spans: test.phases.map((p) => ({ startS: p.startS, endS: p.endS, label: p.phase })),
      setAside: test.settings?.setAside ?? [],
    }),
  ];
  if (exRows.some((r) => r.vco2MlMin !== undefined)) {
    charts.push(
      vSlopeChart({
        vo2MlMin: col(exRows, "vo2MlMin"),
        vco2MlMin: col(exRows, "vco2MlMin"),
        vt1Vo2MlMin: vt1.vo2MlMin.value,
        fit: vSlopeLines(result, rows),
        vt1SetByReviewer: setByReviewer.vt1,
      }),
    );
  }
  if (rows.some((r) => r.veLMin !== undefined)) {
    charts.push(
      ventilatoryEquivalentsChart({
        timeS: time,
        veVo2: ratio("veLMin", "vo2MlMin", 1000),
        veVco2: ratio("veLMin", "vco2MlMin", 1000),
        vt1TimeS: vt1.timeS,
        vt2TimeS: vt2.timeS,
        setByReviewer,
      }),
    );
    const slope = result.indices.veVco2.slopeToVt2;
    const vt2Vco2 = vt2.timeS !== null ? nearest(rows, vt2.timeS)?.vco2MlMin : null;
    charts.push(
      veVsVco2Chart({
        vco2MlMin: col(exRows, "vco2MlMin"),
        veLMin: col(exRows, "veLMin"),
        fit:
          slope.slope.value !== null && slope.intercept.value !== null
            ? { slope: slope.slope.value, interceptLMin: slope.intercept.value, label: slopeToVt2Name(slope) }
            : null,
        vt2Vco2MlMin: vt2Vco2 ?? null,
        setByReviewer,
      }),
    );
  }
  if (rows.some((r) => r.petco2MmHg !== undefined || r.peto2MmHg !== undefined)) {
    charts.push(
      endTidalChart({
        timeS: time,
        peto2MmHg: col(rows, "peto2MmHg"),
        petco2MmHg: col(rows, "petco2MmHg"),
        vt1TimeS: vt1.timeS,
        vt2TimeS: vt2.timeS,
        setByReviewer,
      }),
    );
  }
  const lac = result.indices.lactate;
  if (lac && lac.points.length >= 3) {
    // thresholds named as the page names them, with their value; VT1/VT2 on the lactate chart's own axis
    const bySpeed = lac.axis === "speedKmh";
    const d = bySpeed ? 1 : 0;
    const xs = lac.points.map((p) => p.x);
    const vtAt = (a: typeof result.indices.atVt1) => (a ? (bySpeed ? a.speedKmh.value : a.workW.value) : null);
    const recovery = lac.recoveryPoints.length;
    charts.push(
      lactateChart({
        ...(bySpeed ? { speedKmh: xs } : { workW: xs }),
        lactateMmolL: lac.points.map((p) => p.lactateMmolL),
        thresholds: lac.thresholds.flatMap((t) => {
          const v = t.intensity.value;
          if (v === null) return [];
          const label = `${LACTATE_METHOD_NAMES[t.id]} ${formatNumber(v, d)} ${lac.unit}`;
          return [
            {
              ...(bySpeed ? { speedKmh: v } : { workW: v }),
              label,
              ...(t.lactateMmolL.value !== null ? { lactateMmolL: t.lactateMmolL.value } : {}),
            },
          ];
        }),
        vt1: vtAt(result.indices.atVt1),
        vt2: vtAt(result.indices.atVt2),
        setByReviewer,
        ...(recovery
          ? {
              note: `${recovery} recovery sample${recovery === 1 ? "" : "s"} (peak lactate ${formatNumber(lac.peakMmolL ?? NaN, 1)} mmol/L) not on the curve`,
            }
          : {}),
      }),
    );
  }
  return charts;
}

/**
 * The V-slope method's two lines for the chart, over the VO2 range of the display rows in its data window, or null
 * when the method gave no estimate. The thresholds layer owns the fit; this only reads it.
 */
function vSlopeLines(result: AnalysisResult, rows: readonly BreathRow[]) {
  const m = result.thresholds.methods.find((e) => e.id === "vt1-v-slope");
  if (!m || m.vo2MlMin.value === null) return null;
  const { s1, s2, intercept1, intercept2, intersectionVo2 } = m.fit;
  if (s1 == null || s2 == null || intercept1 == null || intercept2 == null || intersectionVo2 == null) return null;
  let lo = Infinity;
  let hi = -Infinity;
  for (const r of rows)
    if (r.timeS >= m.window.startS && r.timeS <= m.window.endS && typeof r.vo2MlMin === "number") {
      lo = Math.min(lo, r.vo2MlMin);
      hi = Math.max(hi, r.vo2MlMin);
    }
  if (!(lo < intersectionVo2 && intersectionVo2 < hi)) return null;
  return { s1, s2, intercept1, intercept2, fromVo2MlMin: lo, crossVo2MlMin: intersectionVo2, toVo2MlMin: hi };
}

function nearest(rows: readonly BreathRow[], timeS: number): BreathRow | undefined {
  let best: BreathRow | undefined;
  for (const r of rows) if (!best || Math.abs(r.timeS - timeS) < Math.abs(best.timeS - timeS)) best = r;
  return best;
}
