import type { Issue } from "../core";
import { makeIssue } from "../core";
import { isBlankCell, isClockCell, parseClock, parseNumberCell } from "./parseCell";
import { parseUnitText } from "./parseUnitText";
import type { TableLayout } from "./readTableLayout";

/** A small table read by name: numbers per wanted column, plus the first text column matching `labelNames`. */
export interface SimpleColumns {
  values: Record<string, Float64Array>;
  units: Record<string, string | undefined>;
  headers: Record<string, string>;
  labels?: (string | undefined)[];
  lines: number[];
}

/**
 * Read named numeric columns of a small table (lactate samples, blood gases). `wanted` maps a key to the
 * normalised header names that feed it (letters and digits, lower case, unit in brackets or trailing
 * tokens removed). Time cells may be "m:ss". Unknown cells give NaN and one warning per column.
 */
export function readSimpleColumns(
  layout: TableLayout,
  wanted: Record<string, readonly string[]>,
  labelNames: readonly string[],
  issues: Issue[],
): SimpleColumns {
  const out: SimpleColumns = { values: {}, units: {}, headers: {}, lines: layout.lines };
  const dec = layout.format.decimalMark;
  layout.headers.forEach((header, i) => {
    const bracket = /[([]([^)\]]*)[)\]]/.exec(header);
    const base = (bracket ? header.replace(bracket[0], " ") : header).toLowerCase();
    const tokens = base.split(/[^a-z0-9%]+/).filter((t) => t.length > 0);
    for (let k = tokens.length; k >= 1; k--) {
      const name = tokens.slice(0, k).join("");
      const key = Object.keys(wanted).find((w) => wanted[w].includes(name));
      if (key && !(key in out.values)) {
        const tail = tokens.slice(k).join("/");
        out.headers[key] = header;
        out.units[key] =
          parseUnitText(bracket?.[1]) ?? parseUnitText(layout.units[i]) ?? (tail ? parseUnitText(tail) : undefined);
        const v = new Float64Array(layout.rows.length);
        let bad = 0;
        layout.rows.forEach((r, j) => {
          const c = r[i] ?? null;
          v[j] = isClockCell(c) ? parseClock(c) : parseNumberCell(c, dec);
          if (Number.isNaN(v[j]) && !isBlankCell(c)) bad++;
        });
        if (bad > 0)
          issues.push(
            makeIssue("warning", "not-a-number", `${bad} cell(s) of "${header}" are not numbers and were left empty.`, {
              column: header,
            }),
          );
        out.values[key] = v;
        return;
      }
      if (!out.labels && labelNames.includes(name)) {
        out.labels = layout.rows.map((r) => (isBlankCell(r[i] ?? null) ? undefined : String(r[i]).trim()));
        return;
      }
    }
  });
  return out;
}
