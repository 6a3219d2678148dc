import { ReferenceEquationSchema, type Expr, type ReferenceEquation } from "./equationSchema";
import { LAB_QUANTITIES, PREDICTED_QUANTITIES } from "./quantities";

export interface EquationFileCheck {
  /** The parsed equation when the file passed the schema (it may still have `problems`). */
  equation?: ReferenceEquation;
  /** Plain-words problems; empty when the file is fit to ship. */
  problems: string[];
}

/** Visit every node of an expression tree, depth first, with the names in scope at that node. */
export function walkExpr(
  expr: Expr,
  visit: (node: Expr, scope: ReadonlySet<string>) => void,
  scope: ReadonlySet<string> = new Set(),
): void {
  visit(expr, scope);
  const go = (e: Expr, s: ReadonlySet<string> = scope) => walkExpr(e, visit, s);
  if ("linear" in expr || "const" in expr || "var" in expr || "ref" in expr) return;
  if ("sum" in expr) expr.sum.forEach((e) => go(e));
  else if ("product" in expr) expr.product.forEach((e) => go(e));
  else if ("difference" in expr) expr.difference.forEach((e) => go(e));
  else if ("quotient" in expr) {
    go(expr.quotient.numerator);
    go(expr.quotient.denominator);
  } else if ("scale" in expr) go(expr.scale.of);
  else if ("let" in expr) {
    const inner = new Set(scope);
    for (const d of expr.let.define) {
      go(d.expr, new Set(inner));
      inner.add(d.name);
    }
    go(expr.let.in, inner);
  } else if ("bySex" in expr) {
    if (expr.bySex.male) go(expr.bySex.male);
    if (expr.bySex.female) go(expr.bySex.female);
  } else if ("byErgometer" in expr) {
    if (expr.byErgometer.cycle) go(expr.byErgometer.cycle);
    if (expr.byErgometer.treadmill) go(expr.byErgometer.treadmill);
  } else if ("compare" in expr) {
    const c = expr.compare;
    [c.left, c.right, c.equal, c.greater, c.less].forEach((e) => go(e));
  }
}

function varsOf(node: Expr): string[] {
  if ("var" in node) return [node.var];
  if ("linear" in node) return node.linear.terms.flatMap((t) => t.vars);
  return [];
}

/**
 * Check one reference-equation data file: the schema (zod, the runtime contract) and the rules a
 * schema cannot say — every name used is a predictor or a defined intermediate, categorical
 * predictors carry a coding for every category, branches cover the population's sexes, the LLN
 * is in the equation's unit, references name either an equation or a lab quantity.
 * Cross-file rules (reference targets exist, no cycles, unique ids) are in `checkEquationSet`.
 */
export function checkEquationFile(raw: unknown): EquationFileCheck {
  const parsed = ReferenceEquationSchema.safeParse(raw);
  if (!parsed.success) {
    const id = typeof raw === "object" && raw !== null && "id" in raw ? String((raw as { id: unknown }).id) : "(no id)";
    return {
      problems: parsed.error.issues.map((i) => `${id}: ${i.path.join(".") || "(root)"}: ${i.message}`),
    };
  }
  const eq = parsed.data;
  const problems: string[] = [];
  const say = (msg: string) => problems.push(`${eq.id}: ${msg}`);

  const predictorNames = new Set<string>();
  for (const p of eq.predictors) {
    if (predictorNames.has(p.name)) say(`predictor ${p.name} is declared twice`);
    predictorNames.add(p.name);
    const categorical = p.from === "sex" || p.from === "ergometer";
    if (categorical && !p.coding) say(`predictor ${p.name} (from ${p.from}) needs a coding`);
    if (!categorical && p.coding) say(`predictor ${p.name} (from ${p.from}) is numeric and takes no coding`);
    if (categorical && p.convert) say(`predictor ${p.name} is categorical and takes no unit conversion`);
    if (p.from === "sex" && p.coding) {
      for (const s of eq.population.sexes) if (p.coding[s] === undefined) say(`predictor ${p.name} has no code for ${s}`);
    }
    if (p.from === "ergometer" && p.coding) {
      const needed = eq.ergometer === "both" ? ["cycle", "treadmill"] : [eq.ergometer];
      for (const m of needed)
        if ((p.coding as Record<string, number>)[m] === undefined) say(`predictor ${p.name} has no code for ${m}`);
    }
  }

  const checkTree = (form: Expr, where: string) =>
    walkExpr(
      form,
      (node, scope) => {
        for (const v of varsOf(node)) {
          if (!predictorNames.has(v) && !scope.has(v))
            say(`${where}: name ${v} is neither a predictor nor defined by an enclosing let`);
        }
        if ("bySex" in node) {
          for (const s of eq.population.sexes)
            if (!node.bySex[s]) say(`${where}: bySex has no case for ${s}, a sex of the population`);
        }
        if ("ref" in node) {
          const r = node.ref;
          if ((r.equation === undefined) === (r.quantity === undefined))
            say(`${where}: ref names exactly one of equation or quantity`);
          if (r.quantity && !(LAB_QUANTITIES as readonly string[]).includes(r.quantity))
            say(`${where}: ref quantity ${r.quantity} is not chosen by lab settings`);
          if (
            r.quantity &&
            PREDICTED_QUANTITIES[r.quantity].unit !== r.unit &&
            !(r.quantity === "vo2PeakMlMin" && r.unit === "mL/kg/min")
          ) {
            say(`${where}: ref unit ${r.unit} does not match quantity ${r.quantity}`);
          }
        }
      },
      new Set(),
    );
  checkTree(eq.form, "form");
  if (eq.lln?.method === "formula") checkTree(eq.lln.form, "lln");
  if (eq.lln?.method === "see" && eq.lln.unit !== eq.unit)
    say(`lln SEE unit ${eq.lln.unit} differs from the equation unit ${eq.unit}`);
  if (eq.checkValues.length === 0) say("has no check value");
  return { equation: eq, problems };
}

/** References from one equation to others (fixed ids only). */
export function referencedEquationIds(eq: ReferenceEquation): string[] {
  const ids: string[] = [];
  walkExpr(eq.form, (node) => {
    if ("ref" in node && node.ref.equation) ids.push(node.ref.equation);
  });
  return ids;
}

/** Cross-file rules: unique ids, reference targets exist, no reference cycles. */
export function checkEquationSet(equations: readonly ReferenceEquation[]): string[] {
  const problems: string[] = [];
  const byId = new Map<string, ReferenceEquation>();
  for (const eq of equations) {
    if (byId.has(eq.id)) problems.push(`${eq.id}: id used by two files`);
    byId.set(eq.id, eq);
  }
  for (const eq of equations) {
    for (const target of referencedEquationIds(eq)) {
      if (!byId.has(target)) problems.push(`${eq.id}: refers to unknown equation ${target}`);
    }
  }
  const state = new Map<string, "open" | "done">();
  const visit = (id: string, path: string[]): void => {
    if (state.get(id) === "done") return;
    if (state.get(id) === "open") {
      problems.push(`reference cycle: ${[...path, id].join(" → ")}`);
      return;
    }
    state.set(id, "open");
    const eq = byId.get(id);
    if (eq) for (const t of referencedEquationIds(eq)) visit(t, [...path, id]);
    state.set(id, "done");
  };
  for (const eq of equations) visit(eq.id, []);
  return problems;
}
