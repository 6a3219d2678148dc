import type { Issue } from "@/lib/core";
import { sortIssues } from "@/lib/core";

/** Import problems with the row and column they point at (the issue code only as a data attribute). */
export function ImportIssueTable({ issues, testId }: { issues: Issue[]; testId?: string }) {
  if (issues.length === 0) return <p className="how">No problems were found.</p>;
  return (
    <table data-testid={testId ?? "import-issues"}>
      <thead>
        <tr>
          <th>Severity</th>
          <th>Problem</th>
          <th className="num">Row</th>
          <th>Column</th>
        </tr>
      </thead>
      <tbody>
        {sortIssues(issues).map((i, k) => (
          // the issue's code stays available to developers (data-code), never as visible text
          <tr key={k} className={`sev-${i.severity}`} data-code={i.code}>
            <td>{i.severity}</td>
            <td>{i.message}</td>
            <td className="num">{i.where?.row ?? "—"}</td>
            <td>{i.where?.column ?? "—"}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}
