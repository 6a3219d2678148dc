import type { InterpretationData } from "./interpretationData";
import type { Expr } from "./schema";
import type { VarValue } from "./evaluateCondition";
import type { InterpretInput } from "./types";

function evalExpr(e: Expr, vars: Record<string, VarValue>): number | null {
  if ("const" in e) return e.const;
  if ("var" in e) {
    const v = vars[e.var];
    return typeof v === "number" && Number.isFinite(v) ? v : null;
  }
  if ("mul" in e) {
    let p = 1;
    for (const x of e.mul) {
      const v = evalExpr(x, vars);
      if (v === null) return null;
      p *= v;
    }
    return p;
  }
  const [a, b] = ("div" in e ? e.div : e.sub).map((x) => evalExpr(x, vars));
  if (a === null || b === null) return null;
  if ("div" in e) return b === 0 ? null : a / b;
  return a - b;
}

/**
 * Flatten an input into the variable map the rules read: patient fields, measured values, the referral
 * question, then the derived variables of derived.json in file order (e.g. ppo values, BMI).
 * `undefined` and non-finite numbers become `null` (not available).
 */
export function buildVariables(input: InterpretInput, data: InterpretationData): Record<string, VarValue> {
  const vars: Record<string, VarValue> = {};
  const put = (k: string, v: unknown) => {
    if (v === undefined || v === null) vars[k] = null;
    else if (typeof v === "number") vars[k] = Number.isFinite(v) ? v : null;
    else if (typeof v === "string" || typeof v === "boolean") vars[k] = v;
  };
  for (const [k, v] of Object.entries(input.patient ?? {})) put(k, v);
  for (const [k, v] of Object.entries(input.values ?? {})) put(k, v);
  vars.referral = input.referral;
  for (const d of data.derived) {
    const existing = vars[d.id];
    if (d.onlyIfMissing && existing !== null && existing !== undefined) continue;
    vars[d.id] = evalExpr(d.expr, vars);
  }
  return vars;
}
