import { describe, expect, it } from "vitest";
import type { ChartSpec } from "../../lib/report/charts/chartSpec";
import { renderChartSvg, chartLayout, axisScale } from "../../lib/report/charts/renderChartSvg";
import { vSlopeChart } from "../../lib/report/charts/vSlopeChart";
import { timeCourseChart } from "../../lib/report/charts/timeCourseChart";
import { ventilatoryEquivalentsChart } from "../../lib/report/charts/ventilatoryEquivalentsChart";
import { endTidalChart } from "../../lib/report/charts/endTidalChart";
import { veVsVco2Chart } from "../../lib/report/charts/veVsVco2Chart";
import { lactateChart } from "../../lib/report/charts/lactateChart";
import { thinPoints } from "../../lib/report/charts/thinPoints";

/**
 * Minimal XML well-formedness check (tags balanced and properly nested, attributes quoted, no raw
 * "<" or bare "&" in text or attribute values). Enough for the renderer's flat output.
 */
function checkWellFormed(xml: string): void {
  const stack: string[] = [];
  const tag = /<(\/?)([a-zA-Z][\w:-]*)((?:\s+[\w:-]+="[^"<]*")*)\s*(\/?)>/y;
  let i = 0;
  while (i < xml.length) {
    const lt = xml.indexOf("<", i);
    const text = xml.slice(i, lt === -1 ? xml.length : lt);
    if (/&(?!(amp|lt|gt|quot|apos|#\d+);)/.test(text)) throw new Error(`bare & in text: ${text}`);
    if (lt === -1) break;
    tag.lastIndex = lt;
    const m = tag.exec(xml);
    if (!m) throw new Error(`malformed tag at ${lt}: ${xml.slice(lt, lt + 80)}`);
    if (/&(?!(amp|lt|gt|quot|apos|#\d+);)/.test(m[3])) throw new Error(`bare & in attribute: ${m[0]}`);
    if (m[1]) {
      if (stack.pop() !== m[2]) throw new Error(`unbalanced </${m[2]}>`);
    } else if (!m[4]) stack.push(m[2]);
    i = tag.lastIndex;
  }
  if (stack.length) throw new Error(`unclosed: ${stack.join(",")}`);
}

/** Elements of a name with their attributes, parsed from the SVG string. */
function elements(svg: string, name: string): Record<string, string>[] {
  const out: Record<string, string>[] = [];
  for (const m of svg.matchAll(new RegExp(`<${name}\\s([^>]*?)/?>`, "g"))) {
    const attrs: Record<string, string> = {};
    for (const a of m[1].matchAll(/([\w:-]+)="([^"]*)"/g)) attrs[a[1]] = a[2];
    out.push(attrs);
  }
  return out;
}

const base: ChartSpec = Object.freeze({
  id: "known",
  title: 'Known <points> & "quotes"',
  x: { label: "X", unit: "u", min: 0, max: 100 },
  y: { label: "Y", unit: "v", min: 0, max: 50 },
  series: [
    {
      name: "A",
      kind: "points",
      points: [
        [0, 0],
        [50, 25],
        [100, 50],
      ],
    },
  ],
  markers: [{ x: 25, label: "VT1", kind: "vt1" }],
}) as ChartSpec;

describe("renderChartSvg", () => {
  it("maps known points to pixel coordinates computed by hand", () => {
    // Hand layout for 640 × 360, one legend row, no right axis:
    // left = 58, right = 640 - 18 = 622; top = 24 (title) + 16 (legend) + 10 = 50; bottom = 360 - 42 = 318.
    expect(chartLayout(base, 640, 360)).toMatchObject({ left: 58, right: 622, top: 50, bottom: 318 });
    const svg = renderChartSvg(base, { width: 640, height: 360 });
    // x: 58 + (v / 100) · 564;  y: 318 - (v / 50) · 268
    // (0,0) → (58, 318); (50,25) → (58 + 282, 318 - 134) = (340, 184); (100,50) → (622, 50).
    const dots = elements(svg, "circle").filter((c) => c.r === "2.2");
    expect(dots.map((c) => [Number(c.cx), Number(c.cy)])).toEqual([
      [58, 318],
      [340, 184],
      [622, 50],
    ]);
  });

  it("places a marker at the right x with its label", () => {
    const svg = renderChartSvg(base, { width: 640, height: 360 });
    // x = 25 → 58 + 0.25 · 564 = 199; the line spans the plot from top 50 to bottom 318.
    const vt1 = elements(svg, "line").find((l) => l["stroke-dasharray"] === "6 3");
    expect(vt1).toMatchObject({ x1: "199", x2: "199", y1: "50", y2: "318" });
    expect(svg).toMatch(/<text x="202" [^>]*>VT1<\/text>/);
  });

  it("is well-formed XML with inline presentation attributes only, escaped text and no classes", () => {
    const svg = renderChartSvg(base);
    checkWellFormed(svg);
    expect(svg.startsWith('<svg xmlns="http://www.w3.org/2000/svg" width="640" height="360" viewBox="0 0 640 360">')).toBe(true);
    expect(svg).not.toMatch(/class=|style=|<style/);
    expect(svg).toContain("Known &lt;points&gt; &amp; &quot;quotes&quot;");
    // Only the element kinds SVG-to-PDFKit draws reliably.
    const names = new Set([...svg.matchAll(/<([a-z]+)[\s>]/g)].map((m) => m[1]));
    for (const n of names) expect(["svg", "rect", "line", "path", "circle", "text"]).toContain(n);
  });

  it("draws band labels on a plate, not with a stroked halo the PDF renderer paints over the letters", () => {
    const svg = renderChartSvg({
      ...base,
      bands: [{ from: 10, to: 40, label: "exercise (invented)" }],
    });
    // SVG-to-PDFKit ignores paint-order: a white stroke under "paint-order: stroke" covered the text in the PDF
    expect(svg).not.toMatch(/paint-order/);
    const tag = /<text ([^>]*)>exercise \(invented\)<\/text>/.exec(svg)![1];
    const label = Object.fromEntries([...tag.matchAll(/([\w:-]+)="([^"]*)"/g)].map((a) => [a[1], a[2]]));
    expect(label.stroke).toBeUndefined();
    const plates = elements(svg, "rect").filter((r) => r.fill === "#ffffff" && r["fill-opacity"] === "0.85");
    expect(plates).toHaveLength(1);
    // the plate is centred on the label and wider than it (0.55 em per character at 8 px, plus 4 px)
    expect(Number(plates[0].x) + Number(plates[0].width) / 2).toBeCloseTo(Number(label.x), 1);
    expect(Number(plates[0].width)).toBeCloseTo("exercise (invented)".length * 8 * 0.55 + 4, 1);
  });

  it("draws data set aside by review as its own darker band, labelled at the top, over the phase bands", () => {
    const svg = renderChartSvg({
      ...base,
      bands: [
        { from: 10, to: 80, label: "exercise (invented)" },
        { from: 30, to: 40, label: "set aside", kind: "set-aside" },
      ],
    });
    const rects = elements(svg, "rect");
    const phase = rects.find((r) => r.fill === "#f2eee3")!;
    const aside = rects.find((r) => r.fill === "#ddd3c4")!;
    expect(phase).toBeDefined();
    expect(aside).toBeDefined();
    // drawn after the phase band (on top of it), and a tenth of the x range wide against the phase's 70 %
    expect(svg.indexOf('fill="#ddd3c4"')).toBeGreaterThan(svg.indexOf('fill="#f2eee3"'));
    expect(Number(aside.width) / Number(phase.width)).toBeCloseTo(10 / 70, 2);
    // its label sits near the top of the plot, the phase label near the foot
    const y = (label: string) => Number(new RegExp(`<text [^>]*y="([\\d.]+)"[^>]*>${label}</text>`).exec(svg)![1]);
    expect(y("set aside")).toBeLessThan(y("exercise \\(invented\\)"));
  });

  it("clips a reference line to the plot: identity on x 0-100, y 0-50 runs (0,0)→(50,50)", () => {
    const spec: ChartSpec = { ...base, refLines: [{ slope: 1, intercept: 0, label: "identity" }] };
    // Legend: "A" (49.5 px) and "identity" (88 px) fit one row, so the layout is unchanged.
    const svg = renderChartSvg(spec, { width: 640, height: 360 });
    // (0,0) → (58,318); (50,50) → (58 + 282, 50) = (340, 50)
    const ref = elements(svg, "line").find((l) => l["stroke-dasharray"] === "3 3" && l.x1 === "58");
    expect(ref).toMatchObject({ x1: "58", y1: "318", x2: "340", y2: "50" });
    expect(svg).toContain(">identity</text>");
  });

  it("draws a right-axis series against its own scale", () => {
    const spec: ChartSpec = {
      ...base,
      y2: { label: "Z", unit: "w", min: 100, max: 200 },
      series: [
        ...base.series,
        {
          name: "B",
          kind: "line",
          axis: "y2",
          points: [
            [0, 100],
            [100, 200],
          ],
        },
      ],
    };
    // right = 640 - 58 = 582; legend "A" + "B (right axis)" on one row → top 50, bottom 318.
    // (0,100) → (58, 318); (100,200) → (582, 50).
    const svg = renderChartSvg(spec, { width: 640, height: 360 });
    expect(svg).toContain('<path d="M58,318L582,50"');
    expect(svg).toContain("B (right axis)");
  });

  it("rounds a free axis outwards to nice values and says when points were thinned", () => {
    const scale = axisScale({ label: "x", unit: "" }, [3, 97], [0, 100]);
    expect(scale.domain()).toEqual([0, 100]);
    const flat = axisScale({ label: "x", unit: "" }, [5, 5], [0, 100]);
    expect(flat.domain()[0]).toBeLessThan(5);
    expect(flat.domain()[1]).toBeGreaterThan(5);
    const many: [number, number][] = Array.from({ length: 1000 }, (_, i) => [i / 10, (i % 50) / 2]);
    const svg = renderChartSvg(
      { ...base, series: [{ name: "dense", kind: "points", points: many }] },
      { maxPointsPerSeries: 100 },
    );
    expect(elements(svg, "circle").filter((c) => c.r === "2.2")).toHaveLength(100);
    expect(svg).toContain("points thinned to at most 100 per series");
  });

  it("draws an empty chart with a plain message instead of failing", () => {
    const svg = renderChartSvg({ ...base, x: { label: "X", unit: "" }, y: { label: "Y", unit: "" }, series: [], markers: [] });
    checkWellFormed(svg);
    expect(svg).toContain("No data to plot");
  });
});

describe("thinPoints", () => {
  it("keeps first and last and evenly spaced indices", () => {
    const pts = Object.freeze([0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10]);
    // step = 10 / 4 = 2.5 → indices 0, 2.5→3 (round half up), 5, 7.5→8, 10
    expect(thinPoints(pts, 5)).toEqual([0, 3, 5, 8, 10]);
    expect(thinPoints(pts, 20)).toEqual([...pts]);
  });
});

describe("standard chart builders", () => {
  const timeS = [0, 60, 120, 180];
  it("V-slope: VCO2 vs VO2 with identity line and VT1 at its VO2", () => {
    const spec = vSlopeChart({ vo2MlMin: [500, 1000, null, 2000], vco2MlMin: [450, 950, 1500, 2200], vt1Vo2MlMin: 1200 });
    expect(spec.series[0].points).toEqual([
      [500, 450],
      [1000, 950],
      [2000, 2200],
    ]);
    expect(spec.markers).toEqual([{ x: 1200, label: "VT1", kind: "vt1" }]);
    expect(spec.refLines).toEqual([{ slope: 1, intercept: 0, label: "slope 1 (VCO2 = VO2)" }]);
  });
  // invented lines: VCO2 = 0.95·VO2 − 20 below, 1.35·VO2 − 600 above; they cross at VO2 = 580 / 0.40 = 1450 mL/min
  const fit = { s1: 0.95, intercept1: -20, s2: 1.35, intercept2: -600, fromVo2MlMin: 600, crossVo2MlMin: 1450, toVo2MlMin: 2400 };
  it("V-slope: the method's two lines meet at their crossing and run over its VO2 range", () => {
    const spec = vSlopeChart({ vo2MlMin: [600, 2400], vco2MlMin: [550, 2640], vt1Vo2MlMin: 1500, fit });
    const lines = spec.series[1];
    expect(lines.kind).toBe("line");
    expect(lines.name).toBe("V-slope lines (S1 0.95, S2 1.35)");
    expect(lines.points[0]).toEqual([600, 550]);
    expect(lines.points[1][0]).toBe(1450);
    expect(lines.points[1][1]).toBeCloseTo(1357.5, 9);
    expect(1.35 * 1450 - 600).toBeCloseTo(1357.5, 9);
    expect(lines.points[2]).toEqual([2400, 2640]);
    checkWellFormed(renderChartSvg(spec));
    expect(vSlopeChart({ vo2MlMin: [], vco2MlMin: [], fit: null }).series).toHaveLength(1);
  });
  it("V-slope after a reviewer's VT1: the marker reads 'VT1 (reviewer)', the lines are named as the automatic fit", () => {
    // the same invented lines (crossing at 1450 mL/min); the reviewer put VT1 at 1200 mL/min
    const spec = vSlopeChart({ vo2MlMin: [600, 2400], vco2MlMin: [550, 2640], vt1Vo2MlMin: 1200, fit, vt1SetByReviewer: true });
    expect(spec.markers).toEqual([{ x: 1200, label: "VT1 (reviewer)", kind: "vt1" }]);
    expect(spec.series[1].name).toBe("automatic V-slope fit (S1 0.95, S2 1.35; lines cross at 1450 mL/min)");
    expect(spec.note).toBe("VT1 set by the reviewer; the lines are the automatic fit it replaces");
    const svg = renderChartSvg(spec);
    checkWellFormed(svg);
    // the page and the PDF draw the same SVG: both words reach it
    expect(svg).toContain(">VT1 (reviewer)</text>");
    expect(svg).toContain("automatic V-slope fit");
    // the time-based charts label the reviewer's marker the same way
    const tc = timeCourseChart({
      timeS: [0, 600],
      vo2MlMin: [300, 2000],
      vt1TimeS: 300,
      vt2TimeS: 480,
      setByReviewer: { vt1: true },
    });
    expect(tc.markers.map((m) => m.label)).toEqual(["VT1 (reviewer)", "VT2"]);
  });
  it("time-based charts draw time in minutes (s / 60) and place VT markers in minutes", () => {
    const ve = ventilatoryEquivalentsChart({
      timeS,
      veVo2: [30, 28, 27, 32],
      veVco2: [34, 32, 31, 33],
      vt1TimeS: 120,
      vt2TimeS: 180,
    });
    expect(ve.series[0].points[1]).toEqual([1, 28]);
    expect(ve.markers.map((m) => [m.kind, m.x])).toEqual([
      ["vt1", 2],
      ["vt2", 3],
    ]);
    const et = endTidalChart({ timeS, peto2MmHg: [100, 98, 99, 105], petco2MmHg: [38, 40, 41, 38] });
    expect(et.series[1]).toMatchObject({ name: "PETCO2", axis: "y2" });
    const tc = timeCourseChart({ timeS, vo2MlMin: [300, 800, 1200, 1600], hrBpm: [70, 90, 110, 130], workW: [0, 25, 50, 75] });
    expect(tc.series.map((s) => s.name)).toEqual(["VO2", "Heart rate", "Work rate"]);
    // HR and work go on the right axis, from 0, against time in minutes (0, 60, 120, 180 s → 0, 1, 2, 3 min)
    expect(tc.y2).toEqual({ label: "Heart rate and work rate", unit: "bpm, W", min: 0 });
    expect(tc.series[1]).toMatchObject({
      axis: "y2",
      points: [
        [0, 70],
        [1, 90],
        [2, 110],
        [3, 130],
      ],
    });
    // the drawn SVG carries the right-axis title (label and unit) and marks both series as right-axis in the legend
    const svg = renderChartSvg(tc);
    checkWellFormed(svg);
    expect(svg).toMatch(/transform="rotate\(90 [^"]*"[^>]*>Heart rate and work rate \(bpm, W\)<\/text>/);
    expect(svg).toContain(">Heart rate (right axis)</text>");
    expect(svg).toContain(">Work rate (right axis)</text>");
    // an axis names only what is drawn on it: this input has no VCO2
    expect(tc.y).toEqual({ label: "VO2", unit: "mL/min" });
    const both = timeCourseChart({
      timeS,
      vo2MlMin: [300, 800, 1200, 1600],
      vco2MlMin: [250, 700, 1150, 1700],
      hrBpm: [70, 90, 110, 130],
    });
    expect(both.y.label).toBe("VO2 and VCO2");
    expect(both.y2).toEqual({ label: "Heart rate", unit: "bpm", min: 0 });
    const noRight = timeCourseChart({ timeS, vo2MlMin: [300, 800, 1200, 1600] });
    expect(noRight.y2).toBeUndefined();
    expect(renderChartSvg(noRight)).not.toContain("right axis");
  });
  it("VE vs VCO2 draws VCO2 in L/min so the fitted slope applies directly", () => {
    const spec = veVsVco2Chart({ vco2MlMin: [1000, 2000], veLMin: [30, 58], fit: { slope: 28, interceptLMin: 2 } });
    expect(spec.series[0].points).toEqual([
      [1, 30],
      [2, 58],
    ]);
    expect(spec.refLines?.[0]).toMatchObject({ slope: 28, intercept: 2 });
  });
  it("lactate chart sorts samples by work rate and marks thresholds", () => {
    const spec = lactateChart({
      workW: [150, 50, 100],
      lactateMmolL: [4.1, 1.0, 1.8],
      thresholds: [{ workW: 120, label: "LT" }],
    });
    expect(spec.series[0].points).toEqual([
      [50, 1.0],
      [100, 1.8],
      [150, 4.1],
    ]);
    expect(spec.markers).toEqual([{ x: 120, label: "LT", kind: "other" }]);
    for (const s of [spec, vSlopeChart({ vo2MlMin: [], vco2MlMin: [] })]) checkWellFormed(renderChartSvg(s));
  });
});
