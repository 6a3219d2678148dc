import { scaleLinear, type ScaleLinear } from "d3-scale";
import { line } from "d3-shape";
import type { ChartAxis, ChartSpec, PointShape } from "./chartSpec";
import { escapeXml } from "./escapeXml";
import { thinPoints } from "./thinPoints";

export interface RenderChartOptions {
  /** Outer width, px (1 px = 1 pt in the PDF). @default 640 */
  width?: number;
  /** Outer height, px. @default 360 */
  height?: number;
  /** Points kept per series; denser series are thinned evenly (see `thinPoints`). @default 600 */
  maxPointsPerSeries?: number;
}

/**
 * The product's chart palette (its own): five inks that stay apart in colour AND, through dash
 * pattern and point shape, in greyscale print. Series k takes entry k modulo 5.
 */
export const SERIES_INKS = ["#1b5e6b", "#a44a1c", "#5b3f7d", "#5a6b1e", "#35404a"] as const;
export const SERIES_DASHES = ["", "7 3", "2 2.5", "9 3 2 3", "4 4"] as const;
export const SERIES_SHAPES: readonly PointShape[] = ["circle", "triangle", "square", "diamond", "cross"];

/** Threshold marker look: VT1 long dashes, VT2 short dots, others sparse dots. */
export const MARKER_LOOK = {
  vt1: { color: "#8a2b2b", dash: "6 3", width: 1.4 },
  vt2: { color: "#1f3f73", dash: "2 2", width: 1.6 },
  other: { color: "#555555", dash: "1 4", width: 1.2 },
} as const;

/**
 * The report PDF resolves the first family it has registered (Roboto, embedded); a browser uses the first one
 * installed.
 */
const FONT = 'font-family="Roboto, Helvetica, Arial, sans-serif"';
const AXIS_INK = "#333333";
const GRID_INK = "#e4e0d6";
const BAND_FILL = "#f2eee3";
/** Data set aside by review: a darker warm grey than the phases, so the gap in the points reads as deliberate. */
const SET_ASIDE_FILL = "#ddd3c4";
const MUTED_INK = "#666666";
const REF_INK = "#8c8c8c";
const REF_DASH = "3 3";

/** Layout of the plot area inside the outer box, px. Exported so tests can compute pixels by hand. */
export interface ChartLayout {
  left: number;
  right: number;
  top: number;
  bottom: number;
  /** Legend entries: `entry` indexes the series, then the reference lines. */
  legendRows: { x: number; y: number; entry: number }[];
}

const MARGIN_LEFT = 58;
const MARGIN_RIGHT_PLAIN = 18;
const MARGIN_RIGHT_Y2 = 58;
const TITLE_BAND = 24;
const LEGEND_ROW = 16;
const MARGIN_BOTTOM = 42;
const NOTE_BAND = 14;

/**
 * Rough advance width: 0.55 em per character (enough for legend layout; the product's labels average 0.43-0.50 em
 * in Roboto and in Helvetica).
 */
function textWidth(text: string, fontSize: number): number {
  return text.length * fontSize * 0.55;
}

function legendLabel(s: ChartSpec["series"][number]): string {
  return s.name + (s.axis === "y2" ? " (right axis)" : "");
}

/** Where the plot area and legend entries sit for a spec at a given size. */
export function chartLayout(spec: ChartSpec, width: number, height: number): ChartLayout {
  const left = MARGIN_LEFT;
  const right = width - (spec.y2 ? MARGIN_RIGHT_Y2 : MARGIN_RIGHT_PLAIN);
  const legendRows: ChartLayout["legendRows"] = [];
  const labels = [...spec.series.map(legendLabel), ...(spec.refLines ?? []).map((r) => r.label)];
  let x = left;
  let row = 0;
  labels.forEach((label, i) => {
    const w = 30 + textWidth(label, 10) + 14;
    if (x + w > right && x > left) {
      row += 1;
      x = left;
    }
    legendRows.push({ x, y: TITLE_BAND + 6 + row * LEGEND_ROW, entry: i });
    x += w;
  });
  const legendHeight = labels.length > 0 ? (row + 1) * LEGEND_ROW : 0;
  const top = TITLE_BAND + legendHeight + 10;
  const bottom = height - MARGIN_BOTTOM - (spec.note ? NOTE_BAND : 0);
  return { left, right, top, bottom, legendRows };
}

const fmt = (v: number) => (Math.round(v * 100) / 100).toString();

function extent(values: number[]): [number, number] | null {
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of values) {
    if (!Number.isFinite(v)) continue;
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  return lo <= hi ? [lo, hi] : null;
}

/**
 * Linear scale for an axis: the fixed `min`/`max` when given, otherwise the data extent rounded
 * outwards to nice tick values (d3 `nice`). A zero-width extent is widened by ±1 (or ±5 % of the value).
 */
export function axisScale(axis: ChartAxis, values: number[], range: [number, number]): ScaleLinear<number, number> {
  const ext = extent(values) ?? [0, 1];
  let lo = axis.min ?? ext[0];
  let hi = axis.max ?? ext[1];
  if (lo === hi) {
    const pad = lo === 0 ? 1 : Math.abs(lo) * 0.05;
    if (axis.min === undefined) lo -= pad;
    if (axis.max === undefined) hi += pad;
    if (lo === hi) hi = lo + 1;
  }
  if (lo > hi) [lo, hi] = [hi, lo];
  const scale = scaleLinear().domain([lo, hi]).range(range);
  if (axis.min === undefined || axis.max === undefined) {
    const [nlo, nhi] = scale.copy().nice().domain();
    scale.domain([axis.min ?? nlo, axis.max ?? nhi]);
  }
  return scale;
}

function symbol(shape: PointShape, cx: number, cy: number, r: number, ink: string): string {
  const paint = `fill="none" stroke="${ink}" stroke-width="1"`;
  switch (shape) {
    case "circle":
      return `<circle cx="${fmt(cx)}" cy="${fmt(cy)}" r="${fmt(r)}" ${paint}/>`;
    case "square":
      return `<rect x="${fmt(cx - r)}" y="${fmt(cy - r)}" width="${fmt(2 * r)}" height="${fmt(2 * r)}" ${paint}/>`;
    case "triangle": {
      const h = r * 1.15;
      return `<path d="M${fmt(cx)},${fmt(cy - h)}L${fmt(cx + h)},${fmt(cy + h * 0.8)}L${fmt(cx - h)},${fmt(cy + h * 0.8)}Z" ${paint}/>`;
    }
    case "diamond": {
      const h = r * 1.3;
      return `<path d="M${fmt(cx)},${fmt(cy - h)}L${fmt(cx + h)},${fmt(cy)}L${fmt(cx)},${fmt(cy + h)}L${fmt(cx - h)},${fmt(cy)}Z" ${paint}/>`;
    }
    case "cross":
      return `<path d="M${fmt(cx - r)},${fmt(cy - r)}L${fmt(cx + r)},${fmt(cy + r)}M${fmt(cx - r)},${fmt(cy + r)}L${fmt(cx + r)},${fmt(cy - r)}" ${paint}/>`;
  }
}

function axisTitle(axis: ChartAxis): string {
  return axis.unit ? `${axis.label} (${axis.unit})` : axis.label;
}

/**
 * Draw a chart as a standalone SVG string that both a browser and pdfmake (SVG-to-PDFKit) can render:
 * inline presentation attributes only (no classes, no stylesheet), only `line`, `rect`, `circle`,
 * `path` and `text` elements, text in the report font (`FONT`), all text XML-escaped.
 *
 * Look (the product's own): plot frame with light grid, series told apart by colour, dash pattern and
 * point shape (readable in greyscale), a legend under the title, threshold markers as labelled
 * vertical lines (VT1 long dashes, VT2 short dots), reference lines grey dashed (named in the legend), bands as
 * light shaded x-ranges. Dense series are thinned to `maxPointsPerSeries` (a note says so).
 *
 * Pixel mapping: x in [domain] → [layout.left, layout.right]; y → [layout.bottom, layout.top]
 * (see `chartLayout` and `axisScale`). Empty charts draw the frame and "No data to plot".
 */
export function renderChartSvg(spec: ChartSpec, opts: RenderChartOptions = {}): string {
  const width = opts.width ?? 640;
  const height = opts.height ?? 360;
  const maxPoints = opts.maxPointsPerSeries ?? 600;

  let thinned = false;
  const series = spec.series.map((s) => {
    const finite = s.points.filter(([x, y]) => Number.isFinite(x) && Number.isFinite(y));
    if (finite.length > maxPoints) thinned = true;
    return { ...s, points: thinPoints(finite, maxPoints) };
  });
  const note = [spec.note, thinned ? `points thinned to at most ${maxPoints} per series for display` : undefined]
    .filter(Boolean)
    .join("; ");
  const layout = chartLayout({ ...spec, note: note || undefined }, width, height);
  const { left, right, top, bottom } = layout;

  const xs = series.flatMap((s) => s.points.map((p) => p[0]));
  const ys = series.filter((s) => (s.axis ?? "y") === "y").flatMap((s) => s.points.map((p) => p[1]));
  const y2s = series.filter((s) => s.axis === "y2").flatMap((s) => s.points.map((p) => p[1]));
  const x = axisScale(spec.x, xs.length ? xs : spec.markers.map((m) => m.x), [left, right]);
  const y = axisScale(spec.y, ys, [bottom, top]);
  const y2 = spec.y2 ? axisScale(spec.y2, y2s, [bottom, top]) : null;
  const [x0, x1] = x.domain();
  const inX = (v: number) => v >= Math.min(x0, x1) - 1e-9 && v <= Math.max(x0, x1) + 1e-9;

  const out: string[] = [];
  out.push(
    `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}" viewBox="0 0 ${width} ${height}">`,
    `<rect x="0" y="0" width="${width}" height="${height}" fill="#ffffff"/>`,
    `<text x="8" y="17" ${FONT} font-size="13" font-weight="bold" fill="${AXIS_INK}">${escapeXml(spec.title)}</text>`,
  );

  // Bands behind everything; their labels are drawn after the data (on a white plate) so points never hide them.
  const bandLabels: string[] = [];
  for (const b of spec.bands ?? []) {
    const a = Math.max(left, Math.min(right, x(Math.min(b.from, b.to))));
    const z = Math.max(left, Math.min(right, x(Math.max(b.from, b.to))));
    if (z - a <= 0) continue;
    const setAside = b.kind === "set-aside";
    out.push(
      `<rect x="${fmt(a)}" y="${fmt(top)}" width="${fmt(z - a)}" height="${fmt(bottom - top)}" fill="${setAside ? SET_ASIDE_FILL : BAND_FILL}"/>`,
    );
    // a white plate behind the label rather than a stroked halo: the PDF's SVG renderer ignores paint-order and drew the
    // white stroke over the letters, leaving blank boxes; data set aside is labelled at the top, phases at the foot
    const cx = (a + z) / 2;
    const w = textWidth(b.label, 8) + 4;
    const base = setAside ? top + 11 : bottom - 5;
    bandLabels.push(
      `<rect x="${fmt(cx - w / 2)}" y="${fmt(base - 8)}" width="${fmt(w)}" height="11" fill="#ffffff" fill-opacity="0.85"/>`,
      `<text x="${fmt(cx)}" y="${fmt(base)}" ${FONT} font-size="8" text-anchor="middle" fill="${MUTED_INK}">${escapeXml(b.label)}</text>`,
    );
  }

  // Grid and ticks.
  const xTicks = x.ticks(Math.max(2, Math.round((right - left) / 80)));
  const xFormat = x.tickFormat(Math.max(2, Math.round((right - left) / 80)));
  for (const t of xTicks) {
    const px = fmt(x(t));
    out.push(`<line x1="${px}" y1="${fmt(top)}" x2="${px}" y2="${fmt(bottom)}" stroke="${GRID_INK}" stroke-width="0.6"/>`);
    out.push(`<line x1="${px}" y1="${fmt(bottom)}" x2="${px}" y2="${fmt(bottom + 4)}" stroke="${AXIS_INK}" stroke-width="0.8"/>`);
    out.push(
      `<text x="${px}" y="${fmt(bottom + 14)}" ${FONT} font-size="9" text-anchor="middle" fill="${AXIS_INK}">${escapeXml(xFormat(t))}</text>`,
    );
  }
  const yCount = Math.max(2, Math.round((bottom - top) / 45));
  const yFormat = y.tickFormat(yCount);
  for (const t of y.ticks(yCount)) {
    const py = fmt(y(t));
    out.push(`<line x1="${fmt(left)}" y1="${py}" x2="${fmt(right)}" y2="${py}" stroke="${GRID_INK}" stroke-width="0.6"/>`);
    out.push(`<line x1="${fmt(left - 4)}" y1="${py}" x2="${fmt(left)}" y2="${py}" stroke="${AXIS_INK}" stroke-width="0.8"/>`);
    out.push(
      `<text x="${fmt(left - 6)}" y="${fmt(y(t) + 3)}" ${FONT} font-size="9" text-anchor="end" fill="${AXIS_INK}">${escapeXml(yFormat(t))}</text>`,
    );
  }
  if (y2) {
    const y2Format = y2.tickFormat(yCount);
    for (const t of y2.ticks(yCount)) {
      const py = fmt(y2(t));
      out.push(`<line x1="${fmt(right)}" y1="${py}" x2="${fmt(right + 4)}" y2="${py}" stroke="${AXIS_INK}" stroke-width="0.8"/>`);
      out.push(
        `<text x="${fmt(right + 6)}" y="${fmt(y2(t) + 3)}" ${FONT} font-size="9" text-anchor="start" fill="${AXIS_INK}">${escapeXml(y2Format(t))}</text>`,
      );
    }
  }

  // Frame and axis titles.
  out.push(
    `<rect x="${fmt(left)}" y="${fmt(top)}" width="${fmt(right - left)}" height="${fmt(bottom - top)}" fill="none" stroke="${AXIS_INK}" stroke-width="0.8"/>`,
    `<text x="${fmt((left + right) / 2)}" y="${fmt(bottom + 30)}" ${FONT} font-size="10" text-anchor="middle" fill="${AXIS_INK}">${escapeXml(axisTitle(spec.x))}</text>`,
  );
  const midY = fmt((top + bottom) / 2);
  out.push(
    `<text x="14" y="${midY}" transform="rotate(-90 14 ${midY})" ${FONT} font-size="10" text-anchor="middle" fill="${AXIS_INK}">${escapeXml(axisTitle(spec.y))}</text>`,
  );
  if (spec.y2) {
    const rx = fmt(width - 12);
    out.push(
      `<text x="${rx}" y="${midY}" transform="rotate(90 ${rx} ${midY})" ${FONT} font-size="10" text-anchor="middle" fill="${AXIS_INK}">${escapeXml(axisTitle(spec.y2))}</text>`,
    );
  }

  // Reference lines, clipped to the plot area.
  const [ya, yb] = y.domain();
  const yLo = Math.min(ya, yb);
  const yHi = Math.max(ya, yb);
  for (const r of spec.refLines ?? []) {
    let t0 = Math.min(x0, x1);
    let t1 = Math.max(x0, x1);
    if (r.slope !== 0) {
      const atLo = (yLo - r.intercept) / r.slope;
      const atHi = (yHi - r.intercept) / r.slope;
      t0 = Math.max(t0, Math.min(atLo, atHi));
      t1 = Math.min(t1, Math.max(atLo, atHi));
    } else if (r.intercept < yLo || r.intercept > yHi) continue;
    if (!(t1 > t0)) continue;
    const f = (v: number) => r.slope * v + r.intercept;
    out.push(
      `<line x1="${fmt(x(t0))}" y1="${fmt(y(f(t0)))}" x2="${fmt(x(t1))}" y2="${fmt(y(f(t1)))}" stroke="${REF_INK}" stroke-width="1" stroke-dasharray="${REF_DASH}"/>`,
    );
  }

  // Series.
  series.forEach((s, i) => {
    const ink = s.style?.color ?? SERIES_INKS[i % SERIES_INKS.length];
    const scaleY = s.axis === "y2" && y2 ? y2 : y;
    const [ys0, ys1] = scaleY.domain();
    const inY = (v: number) => v >= Math.min(ys0, ys1) - 1e-9 && v <= Math.max(ys0, ys1) + 1e-9;
    if (s.kind === "line") {
      const dash = s.style?.dash ?? SERIES_DASHES[i % SERIES_DASHES.length];
      const d = line<[number, number]>()
        .defined((p) => inX(p[0]) && inY(p[1]))
        .x((p) => x(p[0]))
        .y((p) => scaleY(p[1]))
        .digits(2)(s.points);
      if (d)
        out.push(
          `<path d="${d}" fill="none" stroke="${ink}" stroke-width="${fmt(s.style?.size ?? 1.6)}"${dash ? ` stroke-dasharray="${dash}"` : ""}/>`,
        );
    } else {
      const shape = s.style?.shape ?? SERIES_SHAPES[i % SERIES_SHAPES.length];
      const r = s.style?.size ?? 2.2;
      for (const [px, py] of s.points) {
        if (!inX(px) || !inY(py)) continue;
        out.push(symbol(shape, x(px), scaleY(py), r, ink));
      }
    }
  });

  out.push(...bandLabels);

  // Threshold markers.
  spec.markers.forEach((m, i) => {
    if (!inX(m.x)) return;
    const look = MARKER_LOOK[m.kind];
    const px = x(m.x);
    out.push(
      `<line x1="${fmt(px)}" y1="${fmt(top)}" x2="${fmt(px)}" y2="${fmt(bottom)}" stroke="${look.color}" stroke-width="${look.width}" stroke-dasharray="${look.dash}"/>`,
    );
    const nearRight = px > right - 60;
    const ly = top + 11 + (i % 2) * 11;
    out.push(
      `<text x="${fmt(nearRight ? px - 3 : px + 3)}" y="${fmt(ly)}" ${FONT} font-size="9" font-weight="bold" text-anchor="${nearRight ? "end" : "start"}" fill="${look.color}">${escapeXml(m.label)}</text>`,
    );
  });

  // Legend.
  for (const entry of layout.legendRows) {
    const cy = entry.y + 4;
    let label: string;
    if (entry.entry < series.length) {
      const i = entry.entry;
      const s = series[i];
      label = legendLabel(s);
      const ink = s.style?.color ?? SERIES_INKS[i % SERIES_INKS.length];
      if (s.kind === "line") {
        const dash = s.style?.dash ?? SERIES_DASHES[i % SERIES_DASHES.length];
        out.push(
          `<line x1="${fmt(entry.x)}" y1="${fmt(cy)}" x2="${fmt(entry.x + 24)}" y2="${fmt(cy)}" stroke="${ink}" stroke-width="1.6"${dash ? ` stroke-dasharray="${dash}"` : ""}/>`,
        );
      } else {
        out.push(symbol(s.style?.shape ?? SERIES_SHAPES[i % SERIES_SHAPES.length], entry.x + 12, cy, 3, ink));
      }
    } else {
      label = (spec.refLines ?? [])[entry.entry - series.length].label;
      out.push(
        `<line x1="${fmt(entry.x)}" y1="${fmt(cy)}" x2="${fmt(entry.x + 24)}" y2="${fmt(cy)}" stroke="${REF_INK}" stroke-width="1" stroke-dasharray="${REF_DASH}"/>`,
      );
    }
    out.push(
      `<text x="${fmt(entry.x + 30)}" y="${fmt(cy + 3.5)}" ${FONT} font-size="10" fill="${AXIS_INK}">${escapeXml(label)}</text>`,
    );
  }

  if (xs.length === 0) {
    out.push(
      `<text x="${fmt((left + right) / 2)}" y="${fmt((top + bottom) / 2)}" ${FONT} font-size="11" text-anchor="middle" fill="${MUTED_INK}">No data to plot</text>`,
    );
  }
  if (note) {
    out.push(
      `<text x="${fmt(right)}" y="${fmt(height - 6)}" ${FONT} font-size="8" text-anchor="end" fill="${MUTED_INK}">${escapeXml(note)}</text>`,
    );
  }
  out.push("</svg>");
  return out.join("");
}
