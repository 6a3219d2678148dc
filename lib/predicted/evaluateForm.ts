import type { Ergometer, Sex } from "../core";
import type { Expr } from "./equationSchema";

/** One step of an evaluation, so a reader can redo the arithmetic ("how was this found?"). */
export interface EvaluationStep {
  label: string;
  value?: number;
  unit?: string;
  /** Branch taken, e.g. `male`, `treadmill`, `greater`. */
  branch?: string;
}

/** Why a form could not be evaluated; turned into an issue by the caller. */
export type FormFailure =
  | { kind: "missing"; what: string }
  | { kind: "not-covered"; what: "sex" | "ergometer"; value: string }
  | { kind: "ref"; reason: string }
  | { kind: "non-finite" };

export interface FormContext {
  sex?: Sex;
  ergometer: Ergometer;
  steps: EvaluationStep[];
  /** Resolves a `ref` node to a number in the ref's unit, or a failure. */
  resolveRef: (ref: Extract<Expr, { ref: unknown }>["ref"]) => number | FormFailure;
}

export class FormError {
  constructor(readonly failure: FormFailure) {}
}

function lookup(name: string, scope: ReadonlyMap<string, number>): number {
  const v = scope.get(name);
  if (v === undefined) throw new FormError({ kind: "missing", what: name });
  return v;
}

/**
 * Evaluate a declarative equation form (see `equationSchema.ts`). A fixed interpreter over a
 * closed set of node types — no code in strings, no eval. Throws `FormError` (caught by
 * `evaluateEquation`) when an input is missing or a branch does not cover the patient.
 */
export function evaluateForm(expr: Expr, scope: ReadonlyMap<string, number>, ctx: FormContext): number {
  const ev = (e: Expr, s: ReadonlyMap<string, number> = scope) => evaluateForm(e, s, ctx);
  if ("const" in expr) return expr.const;
  if ("var" in expr) return lookup(expr.var, scope);
  if ("linear" in expr) {
    let total = expr.linear.intercept;
    for (const t of expr.linear.terms) total += t.coef * t.vars.reduce((p, v) => p * lookup(v, scope), 1);
    return total;
  }
  if ("sum" in expr) return expr.sum.reduce((acc, e) => acc + ev(e), 0);
  if ("difference" in expr) return ev(expr.difference[0]) - ev(expr.difference[1]);
  if ("product" in expr) return expr.product.reduce((acc, e) => acc * ev(e), 1);
  if ("quotient" in expr) return ev(expr.quotient.numerator) / ev(expr.quotient.denominator);
  if ("scale" in expr) {
    const inner = ev(expr.scale.of);
    const out = expr.scale.operation === "multiply" ? inner * expr.scale.factor : inner / expr.scale.factor;
    ctx.steps.push({ label: expr.scale.label, value: out });
    return out;
  }
  if ("let" in expr) {
    const inner = new Map(scope);
    for (const d of expr.let.define) {
      const v = ev(d.expr, inner);
      inner.set(d.name, v);
      ctx.steps.push({ label: d.label, value: v, unit: d.unit });
    }
    return ev(expr.let.in, inner);
  }
  if ("bySex" in expr) {
    if (!ctx.sex) throw new FormError({ kind: "missing", what: "sex" });
    const branch = expr.bySex[ctx.sex];
    if (!branch) throw new FormError({ kind: "not-covered", what: "sex", value: ctx.sex });
    ctx.steps.push({ label: "branch by sex", branch: ctx.sex });
    return ev(branch);
  }
  if ("byErgometer" in expr) {
    const branch = expr.byErgometer[ctx.ergometer];
    if (!branch) throw new FormError({ kind: "not-covered", what: "ergometer", value: ctx.ergometer });
    const label = "const" in branch && branch.label ? branch.label : "branch by ergometer";
    ctx.steps.push({ label, branch: ctx.ergometer });
    return ev(branch);
  }
  if ("compare" in expr) {
    const c = expr.compare;
    const left = ev(c.left);
    const right = ev(c.right);
    const outcome = Math.abs(left - right) <= c.equalWithin ? "equal" : left > right ? "greater" : "less";
    ctx.steps.push({ label: c.label, branch: outcome });
    return ev(c[outcome]);
  }
  if ("ref" in expr) {
    const r = ctx.resolveRef(expr.ref);
    if (typeof r !== "number") throw new FormError(r);
    return r;
  }
  const unknown: never = expr;
  throw new Error(`unknown expression node ${JSON.stringify(unknown)}`);
}
