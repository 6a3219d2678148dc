import { evaluateCondition, evaluateRule, type EvalContext } from "./evaluateCondition";
import { unique, weakestStatus } from "./format";
import type { BranchData, GraphData, NodeData } from "./schema";
import type { PathResult, PathStep } from "./types";

/**
 * Walk a data-defined decision graph (the interpretation flow, or a graph scheme such as the
 * lung-resection algorithm). At each node the node's check rules are evaluated and shown; the first
 * case whose condition is true is taken; if none is true the `unknown` branch is taken when some input
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
    let found: BranchData | null = null;
    let sawUnknown = false;
    for (const c of node.cases) {
      const r = evaluateCondition(c.when, ctx);
      if (r.outcome === true) {
        found = c;
        break;
      }
      if (r.outcome === null) sawUnknown = true;
    }
    const taken: BranchData = found ?? (sawUnknown ? node.unknown : node.otherwise);
    const checkText = checks.map((c) => c.text).join("; ");
    steps.push({
      nodeId: node.id,
      title: node.title,
      checks,
      outcome: taken.outcome,
      finding: taken.finding,
      text: checkText ? `${checkText} ⇒ ${taken.finding}` : taken.finding,
      sourceIds: unique([...node.sourceIds, ...checks.flatMap((c) => c.sourceIds)]),
      status: weakestStatus([node.status]),
      next: taken.next ?? null,
    });
    if (taken.end) end = taken.end;
    id = taken.next;
  }
  return { steps, end };
}
