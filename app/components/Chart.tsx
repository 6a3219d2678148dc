import { renderChartSvg } from "@/lib/report/charts/renderChartSvg";
import type { ChartSpec } from "@/lib/report/charts/chartSpec";
import styles from "./Chart.module.css";

/**
 * A chart drawn on the server as the same SVG string the PDF uses (`renderChartSvg`), so the page
 * and the PDF cannot differ. The SVG is built only from escaped text and numbers.
 */
export function Chart({ spec, width = 640, height = 360 }: { spec: ChartSpec; width?: number; height?: number }) {
  return (
    <figure
      className={styles.chart}
      data-testid={`chart-${spec.id}`}
      role="img"
      aria-label={spec.title}
      dangerouslySetInnerHTML={{ __html: renderChartSvg(spec, { width, height }) }}
    />
  );
}
