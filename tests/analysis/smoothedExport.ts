/** A demo CSV as a cart would export it smoothed (INVENTED data in, INVENTED data out). */
const SMOOTHED = ["vo2_ml_min", "vco2_ml_min", "ve_l_min", "rr_br_min", "vt_l", "peto2_mmhg", "petco2_mmhg"];

/** The CSV with each gas and ventilation column replaced by the mean of the breath and the two before it. */
export function threeBreathMean(csv: string): string {
  const lines = csv.trim().split("\n");
  const headerAt = lines.findIndex((l) => !l.startsWith("#"));
  const header = lines[headerAt].split(",");
  const cols = SMOOTHED.map((c) => header.indexOf(c)).filter((i) => i >= 0);
  const rows = lines.slice(headerAt + 1).map((l) => l.split(","));
  const out = rows.map((r, i) =>
    r.map((cell, j) =>
      i < 2 || !cols.includes(j) ? cell : ((Number(rows[i][j]) + Number(rows[i - 1][j]) + Number(rows[i - 2][j])) / 3).toFixed(3),
    ),
  );
  return [...lines.slice(0, headerAt + 1), ...out.map((r) => r.join(","))].join("\n") + "\n";
}

/**
 * The CSV as time averages: each numeric column averaged over consecutive `binS`-s bins of its time column, stamped at the
 * bin's end, the phase taken from the bin's last row (as a cart exporting 10-s averages would).
 */
export function timeAverages(csv: string, binS: number): string {
  const lines = csv.trim().split("\n");
  const headerAt = lines.findIndex((l) => !l.startsWith("#"));
  const header = lines[headerAt].split(",");
  const rows = lines.slice(headerAt + 1).map((l) => l.split(","));
  const tCol = header.indexOf("time_s");
  const bins = new Map<number, string[][]>();
  for (const r of rows) {
    const b = Math.floor(Number(r[tCol]) / binS);
    bins.set(b, [...(bins.get(b) ?? []), r]);
  }
  const out = [...bins.entries()].map(([b, rs]) =>
    header.map((_, j) => {
      if (j === tCol) return String((b + 1) * binS);
      const nums = rs.map((r) => Number(r[j])).filter(Number.isFinite);
      return nums.length === rs.length ? (nums.reduce((a, x) => a + x, 0) / nums.length).toFixed(3) : rs[rs.length - 1][j];
    }),
  );
  return [...lines.slice(0, headerAt + 1), ...out.map((r) => r.join(","))].join("\n") + "\n";
}
