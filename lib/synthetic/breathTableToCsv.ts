import { PLAIN_COLUMNS, type BreathTable } from "../breath";

/**
 * Write a breath table as CSV in the plain column convention (`time_s, vo2_ml_min, …`, see lib/breath),
 * only the columns listed in `table.fields`. Pure: returns the text.
 */
export function breathTableToCsv(table: BreathTable): string {
  const columns = Object.entries(PLAIN_COLUMNS).filter(([, field]) => table.fields.includes(field));
  const lines = [columns.map(([header]) => header).join(",")];
  for (const row of table.rows) {
    lines.push(columns.map(([, field]) => (row[field] === undefined ? "" : String(row[field]))).join(","));
  }
  return lines.join("\n") + "\n";
}
