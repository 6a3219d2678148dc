/**
 * Clinical data problems travel as values, never as exceptions.
 * Only programming mistakes throw (see DEVELOPERS.md, "Two kinds of error").
 */
export type Severity = "error" | "warning" | "info";

/** Where a problem sits: any of row (1-based, as the user sees the file), column name, field path or time. */
export interface IssueWhere {
  row?: number;
  column?: string;
  field?: string;
  timeS?: number;
}

export interface Issue {
  severity: Severity;
  /** Stable machine code, kebab-case, e.g. `time-goes-backwards`. */
  code: string;
  /** Plain words for a clinician: what is wrong and what to do. */
  message: string;
  where?: IssueWhere;
}

/** Build an issue; `where` is dropped when empty so JSON stays small. */
export function makeIssue(severity: Severity, code: string, message: string, where?: IssueWhere): Issue {
  const clean: IssueWhere = {};
  if (where) {
    for (const [k, v] of Object.entries(where)) {
      if (v !== undefined && v !== null) (clean as Record<string, unknown>)[k] = v;
    }
  }
  return Object.keys(clean).length > 0 ? { severity, code, message, where: clean } : { severity, code, message };
}

export function hasErrors(issues: readonly Issue[]): boolean {
  return issues.some((i) => i.severity === "error");
}

const SEVERITY_RANK: Record<Severity, number> = { error: 0, warning: 1, info: 2 };

/** Errors first, then warnings, then information; stable within a severity. */
export function sortIssues(issues: readonly Issue[]): Issue[] {
  return issues
    .map((issue, index) => ({ issue, index }))
    .sort((a, b) => SEVERITY_RANK[a.issue.severity] - SEVERITY_RANK[b.issue.severity] || a.index - b.index)
    .map((x) => x.issue);
}
