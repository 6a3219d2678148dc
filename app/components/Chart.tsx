import { renderChartSvg } from "@/lib/report/charts/renderChartSvg";
import type { ChartSpec } from "@/lib/report/charts/chartSpec";
import styles from "./Chart.module.css";
import { describeChart } from "./describeChart";

/**
 * A chart drawn on the server as the same SVG string the PDF uses (`renderChartSvg`), so the page
 * and the PDF cannot differ. The SVG is built only from escaped text and numbers. The figure is an
 * image to assistive technology, labelled with what it shows (`describeChart`); on a narrow screen it
 * keeps a legible size and scrolls sideways inside its own box.
 */
export function Chart({
  spec,
  width = 640,
  height = 360,
  className,
}: {
  spec: ChartSpec;
  width?: number;
  height?: number;
  className?: string;
}) {
  return (
    <figure
      className={className ? `${styles.chart} ${className}` : styles.chart}
      data-testid={`chart-${spec.id}`}
      role="img"
      aria-label={describeChart(spec)}
      dangerouslySetInnerHTML={{ __html: renderChartSvg(spec, { width, height }) }}
    />
  );
}
