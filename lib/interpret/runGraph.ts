import { evaluateCondition, evaluateRule, type EvalContext } from "./evaluateCondition";
import { unique, weakestStatus } from "./format";
import type { BranchData, GraphData, NodeData } from "./schema";
import type { PathResult, PathStep } from "./types";

/**
 * Walk a data-defined decision graph (the interpretation flow, or a graph scheme such as the
 * lung-resection algorithm). At each node the node's check rules are evaluated and shown; the first
 * case whose condition is true is taken (when cases of other outcomes hold too, the step's `conflict` says so); if none is true the `unknown` branch is taken when some input
 * was missing, else `otherwise`. A branch with neither `next` nor `end` stops the walk (not assessable).
 * The graph is acyclic (checked at load), so the walk ends.
 */
export function runGraph(graph: GraphData, ctx: EvalContext): PathResult {
  const nodes = new Map<string, NodeData>(graph.nodes.map((n) => [n.id, n]));
  const steps: PathStep[] = [];
  let id: string | undefined = graph.start;
  let end: PathResult["end"] = null;
  while (id) {
    const node: NodeData = nodes.get(id)!;
    const checks = node.checks.map((c) => evaluateRule(c, ctx));
    const taken = branchTaken(node, ctx);
    // criteria of branches with other outcomes that hold too (e.g. < 10 mL/kg/min and > 75 % predicted): the first
    // listed case is taken (the data lists the cautious one first) and the step says so, for a reviewer to decide
    const alsoTrue = node.cases.filter(
      (c) => c !== taken && c.outcome !== taken.outcome && evaluateCondition(c.when, ctx).outcome === true,
    );
    const conflict = alsoTrue.length
      ? `the criteria of ${unique(alsoTrue.map((c) => `"${c.finding}"`)).join(" and ")} hold too; "${taken.finding}", listed first, is taken: a reviewer decides`
      : "";
    const checkText = checks.map((c) => c.text).join("; ");
    // where an end of a measurement's uncertainty band takes another branch here, say so (as schemes and the effort
    // verdict do); the walk goes on along the value's branch
    const parts: string[] = [];
    for (const end of ctx.bandEnds ?? []) {
      // each other branch with the criterion that takes it there (an end on predicted body mass can reach "capacity
      // adequate" by % predicted although its per-kg value stays under the per-kg cut-off: name the % predicted)
      const other = [end.low, end.high]
        .map((e) => ({ e, b: branchTaken(node, e) }))
        .filter(({ b }) => b.outcome !== taken.outcome && b.outcome !== "not-assessable")
        .map(({ e, b }) => {
          const by = metCriterion(b, e);
          return `"${b.finding}"${by ? ` (by ${by})` : ""}`;
        });
      if (other.length > 0) parts.push(`the ${end.words} reaches ${unique(other).join(" and ")}`);
    }
    const borderline = parts.join("; ");
    const base = checkText ? `${checkText} ⇒ ${taken.finding}` : taken.finding;
    const line = conflict ? `${base} (conflicting criteria: ${conflict})` : base;
    steps.push({
      nodeId: node.id,
      title: node.title,
      checks,
      outcome: taken.outcome,
      finding: taken.finding,
      text: borderline ? `${line} (borderline: ${borderline})` : line,
      ...(borderline ? { borderline } : {}),
      ...(conflict ? { conflict } : {}),
      sourceIds: unique([...node.sourceIds, ...checks.flatMap((c) => c.sourceIds)]),
      status: weakestStatus([node.status]),
      next: taken.next ?? null,
    });
    if (taken.end) end = taken.end;
    id = taken.next;
  }
  return { steps, end };
}

/** The branch a node takes in a context: its first true case, else `unknown` when an input was missing, else `otherwise`. */
function branchTaken(node: NodeData, ctx: EvalContext): BranchData {
  let sawUnknown = false;
  for (const c of node.cases) {
    const r = evaluateCondition(c.when, ctx);
    if (r.outcome === true) return c;
    if (r.outcome === null) sawUnknown = true;
  }
  return sawUnknown ? node.unknown : node.otherwise;
}

/**
 * What holds for a branch's condition in a context, in words (the met comparisons of its rule), or "" when unclear.
 * The context is a band end: the names and predicted-value labels the measured value carries ("MVV estimated as FEV1 ×
 * 40") describe the value, not the end (the × 35 one), so they are left out, with a fresh rule memo.
 */
function metCriterion(branch: BranchData, end: EvalContext): string {
  const ctx: EvalContext = { ...end, names: undefined, predicted: {}, ruleCache: new Map() };
  if (!("when" in branch)) return "";
  const when = (branch as NodeData["cases"][number]).when;
  if ("rule" in when) {
    const r = evaluateRule(when.rule, ctx);
    return r.outcome === true ? (r.text.split(" → ")[0] ?? "") : "";
  }
  const r = evaluateCondition(when, ctx);
  return r.outcome === true ? r.text : "";
}
