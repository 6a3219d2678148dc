import type { Issue } from "@/lib/core";
import { sortIssues } from "@/lib/core";

export function IssueList({ issues, testId }: { issues: Issue[]; testId?: string }) {
  if (issues.length === 0) return <p className="how">No problems were found.</p>;
  return (
    <ul className="issues" data-testid={testId ?? "issue-list"}>
      {sortIssues(issues).map((i, k) => (
        // the issue's code stays available to developers (data-code), never as visible text
        <li key={k} className={`sev-${i.severity}`} data-code={i.code}>
          <strong>{i.severity}</strong> · {i.message}
          {i.where?.row ? (
            <span className="how">
              {" "}
              (row {i.where.row}
              {i.where.column ? `, column ${i.where.column}` : ""})
            </span>
          ) : null}
        </li>
      ))}
    </ul>
  );
}
