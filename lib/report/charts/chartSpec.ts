/**
 * A chart as plain data: what to draw, not how. Built by the chart builders from arrays of canonical
 * values, drawn by `renderChartSvg` for both the page and the PDF.
 */

/** One axis: label and unit shown as "label (unit)"; `min`/`max` fix the domain (otherwise data extent, rounded). */
export interface ChartAxis {
  label: string;
  unit: string;
  min?: number;
  max?: number;
}

/** Point symbol of a "points" series; each differs in shape so charts stay readable in greyscale. */
export type PointShape = "circle" | "square" | "triangle" | "diamond" | "cross";

/** Optional overrides of a series' look; by default the series index picks colour, dash and shape. */
export interface SeriesStyle {
  /** Stroke/fill colour, e.g. "#1b6f7a". */
  color?: string;
  /** SVG dash array for lines, e.g. "6 3"; "" = solid. */
  dash?: string;
  shape?: PointShape;
  /** Point radius or line width, px. */
  size?: number;
}

export interface ChartSeries {
  name: string;
  kind: "points" | "line";
  /** [x, y] pairs in the axes' units; non-finite pairs are skipped. */
  points: [number, number][];
  /** Which vertical axis the series is drawn against. @default "y" */
  axis?: "y" | "y2";
  style?: SeriesStyle;
}

/** A vertical line at `x` with a label (a threshold time, work rate or VO2). */
export interface ChartMarker {
  x: number;
  label: string;
  kind: "vt1" | "vt2" | "other";
}

/** A straight reference line y = slope·x + intercept against the primary y axis (e.g. the identity line). */
export interface ChartRefLine {
  slope: number;
  intercept: number;
  label: string;
}

/** A shaded x-range, e.g. an exercise phase or an intensity domain. */
export interface ChartBand {
  from: number;
  to: number;
  label: string;
  /** A phase of the test (default, pale, label at the foot) or data set aside by review (darker, label at the top). */
  kind?: "phase" | "set-aside";
}

export interface ChartSpec {
  /** Stable id, kebab-case, e.g. `v-slope`. */
  id: string;
  title: string;
  x: ChartAxis;
  y: ChartAxis;
  /** Secondary axis on the right, used by series with `axis: "y2"`. */
  y2?: ChartAxis;
  series: ChartSeries[];
  markers: ChartMarker[];
  refLines?: ChartRefLine[];
  bands?: ChartBand[];
  /** A plain-words note drawn under the chart (e.g. "points thinned to 600 for print"). */
  note?: string;
}
