import { CLINICAL_CAUTION } from "../lib/report/caution";
import type { Command } from "commander";
import { plausibilityProblem, type Ergometer, type Issue, type Patient, type PlausibleField, type Sex } from "../lib/core";
import {
  DEFAULT_LAB_SETTINGS,
  EQUATIONS,
  evaluateEquation,
  findEquation,
  predictAll,
  toQuantity,
  type PredictedValue,
} from "../lib/predicted";
import { EXIT_STATUS_HELP, UsageError } from "./usageError";

interface PredictOptions {
  list?: boolean;
  json?: boolean;
  sex?: string;
  age?: string;
  heightCm?: string;
  weightKg?: string;
  fev1L?: string;
  ergometer?: string;
  equation?: string;
}

function rootOf(cmd: Command): Command {
  let c = cmd;
  while (c.parent) c = c.parent;
  return c;
}

/** A numeric option within the plausibility limits shared with the upload form and `cpet analyse`. */
function num(flag: string, raw: string | undefined, field: PlausibleField, required: boolean): number | undefined {
  if (raw === undefined) {
    if (required) throw new UsageError(`${flag} is required`);
    return undefined;
  }
  const n = Number(raw);
  if (raw.trim() === "" || !Number.isFinite(n)) throw new UsageError(`${flag} needs a number, got "${raw}"`);
  const problem = plausibilityProblem(field, n);
  if (problem) throw new UsageError(`${flag}: ${problem}`);
  return n;
}

/** A prediction as printed: value, unit, equation, limits and issues (steps left to `--json` consumers of the library). */
function brief(pv: PredictedValue) {
  return {
    value: pv.value,
    unit: pv.unit,
    equationId: pv.equationId,
    equation: pv.equationLabel,
    status: pv.status,
    ...(pv.lln !== undefined ? { lln: pv.lln } : {}),
    ...(pv.uln !== undefined ? { uln: pv.uln } : {}),
    ...(pv.limitMethod ? { limitMethod: pv.limitMethod } : {}),
    ...(pv.reason ? { reason: pv.reason } : {}),
    usedEquationIds: [...new Set(pv.usedEquationIds)],
    issues: pv.issues,
  };
}

function listText(): string {
  return (
    EQUATIONS.map((e) => `${e.id}\t${e.quantity}\t${e.unit}\t${e.ergometer}\t${e.kind}\t${e.status}\t${e.label}`).join("\n") +
    "\n"
  );
}

/** Build the JSON answer for `cpet predict`; bad input throws `UsageError` (reported plainly). */
export function runPredict(opts: PredictOptions): unknown {
  if (opts.sex !== undefined && opts.sex !== "male" && opts.sex !== "female")
    throw new UsageError(`--sex must be male or female, got "${opts.sex}"`);
  const ergometer = opts.ergometer ?? "cycle";
  if (ergometer !== "cycle" && ergometer !== "treadmill")
    throw new UsageError(`--ergometer must be cycle or treadmill, got "${ergometer}"`);
  if (opts.sex === undefined) throw new UsageError("--sex is required (male or female)");
  const patient: Patient = {
    sex: opts.sex as Sex,
    ageY: num("--age", opts.age, "ageY", true),
    heightCm: num("--height-cm", opts.heightCm, "heightCm", true),
    weightKg: num("--weight-kg", opts.weightKg, "weightKg", true),
  };
  const fev1L = num("--fev1-l", opts.fev1L, "fev1L", false);
  const spirometry = fev1L === undefined ? undefined : { fev1L };
  const erg = ergometer as Ergometer;

  if (opts.equation !== undefined) {
    const eq = findEquation(opts.equation);
    if (!eq) throw new UsageError(`no reference equation "${opts.equation}"; see cpet predict --list`);
    const pv = evaluateEquation(eq, { patient, ergometer: erg, spirometry }, { labSettings: DEFAULT_LAB_SETTINGS });
    const out: Record<string, unknown> = { ergometer: erg, patient, quantity: eq.quantity, ...brief(pv) };
    if (eq.quantity === "vo2PeakMlMin" || eq.quantity === "vo2PeakMlKgMin") {
      const ml = toQuantity(pv, "vo2PeakMlMin", patient.weightKg);
      const perKg = toQuantity(pv, "vo2PeakMlKgMin", patient.weightKg);
      out.vo2PeakMlMin = ml.value;
      out.vo2PeakMlKgMin = perKg.value;
      if (ml.lln !== undefined) out.vo2PeakLlnMlMin = ml.lln;
    }
    return out;
  }
  const set = predictAll(patient, erg, DEFAULT_LAB_SETTINGS, { spirometry });
  const values: Record<string, unknown> = {};
  for (const [q, pv] of Object.entries(set.values)) if (pv) values[q] = brief(pv);
  return { ergometer: erg, patient, body: set.body, ...values, issues: set.issues };
}

/**
 * `cpet predict`: predicted values for a patient from the reference-equation data.
 *   cpet predict --sex male --age 50 --height-cm 175 --weight-kg 80 --ergometer cycle --json
 *   cpet predict ... --equation friend-2017 --json   (one equation; vo2PeakMlMin in mL/min)
 *   cpet predict --list                               (every equation id, quantity, unit, status)
 * stdout carries only the JSON (or the list); bad input gives a plain message on stderr and exit status 2.
 */
export function registerPredict(program: Command): void {
  const cmd = program
    .command("predict")
    .description("Predicted (reference) values for a patient; every value names its equation and source status")
    .option("--list", "list the reference equations and exit")
    .option("--json", "print one JSON object on stdout")
    .option("--sex <sex>", "male | female")
    .option("--age <years>", "age in years")
    .option("--height-cm <cm>", "height in cm")
    .option("--weight-kg <kg>", "body weight in kg")
    .option("--fev1-l <litres>", "FEV1 in litres (for the MVV estimate)")
    .option("--ergometer <kind>", "cycle | treadmill", "cycle")
    .option("--equation <id>", "evaluate one equation (see --list)")
    .addHelpText("after", EXIT_STATUS_HELP);
  // Output goes through the root command's output settings, read at call time, so a caller (or a
  // test) can redirect it after registering.
  cmd.configureOutput({
    writeOut: (s) => {
      const o = rootOf(cmd).configureOutput();
      if (o.writeOut) o.writeOut(s);
      else process.stdout.write(s);
    },
    writeErr: (s) => {
      const o = rootOf(cmd).configureOutput();
      if (o.writeErr) o.writeErr(s);
      else process.stderr.write(s);
    },
  });
  cmd.action((opts: PredictOptions) => {
    const out = (s: string) => cmd.configureOutput().writeOut!(s);
    if (opts.list) {
      out(
        opts.json
          ? JSON.stringify(
              EQUATIONS.map((e) => ({
                id: e.id,
                quantity: e.quantity,
                unit: e.unit,
                ergometer: e.ergometer,
                kind: e.kind,
                status: e.status,
                label: e.label,
              })),
              null,
              2,
            ) + "\n"
          : listText() + CLINICAL_CAUTION + "\n",
      );
      return;
    }
    let result: unknown;
    try {
      result = { ...(runPredict(opts) as Record<string, unknown>), caution: CLINICAL_CAUTION };
    } catch (e) {
      if (e instanceof UsageError) cmd.error(`predict: ${e.message}`, { exitCode: 2, code: "cpet.predict.input" });
      throw e;
    }
    if (opts.json) {
      out(JSON.stringify(result, null, 2) + "\n");
      return;
    }
    out(formatText(result as Record<string, unknown>));
  });
}

/** The text answer: one line per predicted value (value, limit, equation, evidence status), every issue, the caution. */
function formatText(result: Record<string, unknown>): string {
  type Printed = { value: number | null; unit: string; equationId: string; status?: string; lln?: number; issues?: Issue[] };
  const lines: string[] = [];
  const issues: Issue[] = [...((result.issues as Issue[] | undefined) ?? [])];
  const line = (name: string, pv: Printed) => {
    const value = pv.value === null ? "not determinable" : `${pv.value.toFixed(pv.unit === "mL/min" ? 0 : 2)} ${pv.unit}`;
    const lln = pv.lln !== undefined ? `LLN ${pv.lln.toFixed(2)}` : "";
    lines.push(`${name}\t${value}\t${lln}\t${pv.equationId}${pv.status ? ` (${pv.status})` : ""}`);
    issues.push(...(pv.issues ?? []));
  };
  // one equation (--equation): the answer itself is the prediction
  if ("equationId" in result && "value" in result) line(String(result.quantity), result as unknown as Printed);
  for (const [k, v] of Object.entries(result))
    if (v && typeof v === "object" && "equationId" in v && "value" in v) line(k, v as Printed);
  // one VO2 equation: the other form of the same prediction (per kg, or per minute)
  if (result.quantity === "vo2PeakMlMin" && typeof result.vo2PeakMlKgMin === "number")
    lines.push(`vo2PeakMlKgMin\t${result.vo2PeakMlKgMin.toFixed(2)} mL/kg/min`);
  if (result.quantity === "vo2PeakMlKgMin" && typeof result.vo2PeakMlMin === "number")
    lines.push(`vo2PeakMlMin\t${result.vo2PeakMlMin.toFixed(0)} mL/min`);
  const seen = new Set<string>();
  for (const i of issues) {
    if (seen.has(i.message)) continue;
    seen.add(i.message);
    lines.push(`${i.severity}: ${i.message}`);
  }
  lines.push(String(result.caution ?? CLINICAL_CAUTION));
  return lines.join("\n") + "\n";
}
