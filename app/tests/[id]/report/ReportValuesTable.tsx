import type { ReportRow } from "@/lib/report/reportModel";
import { displayUnit } from "@/lib/units";
import { TableScroll } from "../../../components/TableScroll";

/** Values with predicted, % predicted, LLN, method and numbered source references. */
export function ReportValuesTable({
  rows,
  sourceNumber,
  testId,
  label,
}: {
  rows: ReportRow[];
  sourceNumber: Map<string, number>;
  testId: string;
  /** What the table holds, for the scroll box's accessible name. */
  label: string;
}) {
  return (
    <TableScroll label={label}>
      <table data-testid={testId} className="wide report-values">
        <thead>
          <tr>
            <th>Measure</th>
            <th className="num">Value</th>
            <th>Unit</th>
            <th className="num">Predicted</th>
            <th className="num">% predicted</th>
            <th className="num">LLN</th>
            <th>Method</th>
            <th>Sources</th>
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr key={r.label}>
              <td>{r.label}</td>
              <td className="num">{r.value}</td>
              <td>{displayUnit(r.unit)}</td>
              <td className="num">{r.predicted ?? ""}</td>
              <td className="num">{r.pctPredicted ?? ""}</td>
              <td className="num">{r.lln ?? ""}</td>
              <td className="how">
                {r.method}
                {r.note ? `. ${r.note}` : ""}
              </td>
              <td className="how">
                {r.sourceIds
                  .map((id) => sourceNumber.get(id))
                  .filter((n, i, all) => n !== undefined && all.indexOf(n) === i)
                  .map((n) => `[${n}]`)
                  .join(" ")}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </TableScroll>
  );
}
