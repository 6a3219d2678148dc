import { z } from "zod";
import { VARIABLE_IDS } from "./variables";

/**
 * Zod schemas of the interpretation data files in reference-equations/interpretation/.
 * The engine is generic: every cut-off, band, flow node and pattern lives in those files,
 * each with its source ids and evidence status.
 */

export const EvidenceStatusSchema = z.enum(["confirmed", "secondary", "recalled", "common-practice", "our-choice"]);

const VariableIdSchema = z.enum(VARIABLE_IDS as [string, ...string[]]);

/** A variable, or the variable a cut-off choice selects (e.g. which VE/VCO2 slope definition). */
export type VarRef = string | { choice: string };
/** A number, or the number a cut-off choice selects. */
export type ValueRef = number | { choice: string };

/**
 * Tri-state condition language. Comparisons with a missing value are "unknown" (null);
 * `all`/`any`/`atLeast` propagate unknowns; `notTrue` treats unknown as not true.
 */
export type Condition =
  | { var: VarRef; op: "<" | "<=" | ">" | ">="; value: ValueRef }
  | { var: VarRef; op: "==" | "!="; value: number | string | boolean }
  | { var: VarRef; op: "in"; values: string[] }
  | { all: Condition[] }
  | { any: Condition[] }
  | { not: Condition }
  | { notTrue: Condition }
  | { atLeast: number; of: Condition[] }
  | { rule: string }
  | { choice: string };

const ChoiceRef = z.strictObject({ choice: z.string() });
const VarRefSchema = z.union([VariableIdSchema, ChoiceRef]);

export const ConditionSchema: z.ZodType<Condition> = z.lazy(() =>
  z.union([
    z.strictObject({ var: VarRefSchema, op: z.enum(["<", "<=", ">", ">="]), value: z.union([z.number(), ChoiceRef]) }),
    z.strictObject({ var: VarRefSchema, op: z.enum(["==", "!="]), value: z.union([z.number(), z.string(), z.boolean()]) }),
    z.strictObject({ var: VarRefSchema, op: z.literal("in"), values: z.array(z.string()).min(1) }),
    z.strictObject({ all: z.array(ConditionSchema).min(1) }),
    z.strictObject({ any: z.array(ConditionSchema).min(1) }),
    z.strictObject({ not: ConditionSchema }),
    z.strictObject({ notTrue: ConditionSchema }),
    z.strictObject({ atLeast: z.number().int().min(1), of: z.array(ConditionSchema).min(1) }),
    z.strictObject({ rule: z.string() }),
    z.strictObject({ choice: z.string() }),
  ]),
) as z.ZodType<Condition>;

const Cited = {
  sourceIds: z.array(z.string()).min(1),
  status: EvidenceStatusSchema,
  note: z.string().optional(),
};

/** Arithmetic for derived variables (e.g. predicted post-operative values). */
export type Expr = { var: string } | { const: number } | { mul: Expr[] } | { div: [Expr, Expr] } | { sub: [Expr, Expr] };

export const ExprSchema: z.ZodType<Expr> = z.lazy(() =>
  z.union([
    z.strictObject({ var: VariableIdSchema }),
    z.strictObject({ const: z.number() }),
    z.strictObject({ mul: z.array(ExprSchema).min(2) }),
    z.strictObject({ div: z.tuple([ExprSchema, ExprSchema]) }),
    z.strictObject({ sub: z.tuple([ExprSchema, ExprSchema]) }),
  ]),
) as z.ZodType<Expr>;

export const ChoiceOptionSchema = z.strictObject({
  id: z.string(),
  label: z.string(),
  /** Number substituted where a condition says `{ "choice": id }` as its value. */
  value: z.number().optional(),
  /** Condition substituted where a condition is `{ "choice": id }`. */
  condition: ConditionSchema.optional(),
  /** Variable substituted where a comparison's `var` is `{ "choice": id }`. */
  variable: VariableIdSchema.optional(),
  /** Free mode string read by a scheme combination (e.g. "worst", "axis:peak"). */
  mode: z.string().optional(),
  ...Cited,
});

export const ChoiceSchema = z.strictObject({
  id: z.string(),
  label: z.string(),
  description: z.string(),
  default: z.string(),
  options: z.array(ChoiceOptionSchema).min(2),
});

export const ChoicesFileSchema = z.strictObject({ $comment: z.string().optional(), choices: z.array(ChoiceSchema) });

export const RuleSchema = z.strictObject({
  id: z.string(),
  /** Finding label when the condition is true, e.g. "reduced". */
  label: z.string(),
  /** Finding label when the condition is false, e.g. "normal". */
  labelFalse: z.string(),
  when: ConditionSchema,
  ...Cited,
});

export const RulesFileSchema = z.strictObject({ $comment: z.string().optional(), rules: z.array(RuleSchema) });

export const DerivedSchema = z.strictObject({
  id: VariableIdSchema,
  expr: ExprSchema,
  /** Compute only when the input does not carry the variable. */
  onlyIfMissing: z.boolean(),
  ...Cited,
});

export const DerivedFileSchema = z.strictObject({ $comment: z.string().optional(), derived: z.array(DerivedSchema) });

export const EndSchema = z.strictObject({ key: z.string(), label: z.string(), severity: z.number().int().min(0) });

export const BranchSchema = z.strictObject({
  /** Outcome key, e.g. "reduced". */
  outcome: z.string(),
  finding: z.string(),
  next: z.string().optional(),
  end: EndSchema.optional(),
});

export const CaseSchema = BranchSchema.extend({ when: ConditionSchema });

export const NodeSchema = z.strictObject({
  id: z.string(),
  title: z.string(),
  /** Rules evaluated and shown at this node. */
  checks: z.array(z.string()),
  /** First case whose condition is true is taken. */
  cases: z.array(CaseSchema).min(1),
  /** Taken when every case is false. */
  otherwise: BranchSchema,
  /** Taken when no case is true and at least one could not be assessed. */
  unknown: BranchSchema,
  ...Cited,
});

export const GraphSchema = z.strictObject({ start: z.string(), nodes: z.array(NodeSchema).min(1) });

export const FlowFileSchema = z.strictObject({
  $comment: z.string().optional(),
  id: z.string(),
  name: z.string(),
  ...Cited,
  graph: GraphSchema,
});

export const EffortFileSchema = z.strictObject({
  $comment: z.string().optional(),
  criteria: z.array(z.string()).min(1),
  verdicts: z
    .array(
      z.strictObject({
        key: z.string(),
        label: z.string(),
        severity: z.number().int().min(0),
        peakConclusionsAllowed: z.boolean(),
        /** The verdict rests on a physiological limit instead of peak RER: its label is followed by the limits reached. */
        restsOnLimit: z.boolean().optional(),
        when: ConditionSchema,
        ...Cited,
      }),
    )
    .min(1),
  otherwise: z.strictObject({
    key: z.string(),
    label: z.string(),
    severity: z.number().int().min(0),
    peakConclusionsAllowed: z.boolean(),
  }),
});

export const PatternSchema = z.strictObject({
  id: z.string(),
  label: z.string(),
  /** Completes "The findings are consistent with ..." */
  consistentWith: z.string(),
  /** The pattern itself rests on effort-dependent findings (e.g. submaximal effort); never masked. */
  usesEffortDependent: z.boolean().optional(),
  features: z
    .array(
      z.strictObject({
        rule: z.string(),
        /** The rule outcome that fits the pattern. */
        expect: z.boolean(),
        weight: z.number().positive(),
        /** Key feature: if it contradicts, the pattern is not supported; if not assessable, support is capped. */
        key: z.boolean().optional(),
      }),
    )
    .min(2),
  ...Cited,
});

export const PatternsFileSchema = z.strictObject({
  $comment: z.string().optional(),
  /** Score boundaries for support levels (engine parameters, not clinical cut-offs). */
  supportLevels: z.strictObject({ strong: z.number(), moderate: z.number(), minFor: z.number().int() }),
  patterns: z.array(PatternSchema).min(1),
});

export const BandSchema = z.strictObject({
  key: z.string(),
  label: z.string(),
  severity: z.number().int().min(0),
  when: ConditionSchema,
  ...Cited,
});

export const AxisSchema = z.strictObject({
  id: z.string(),
  label: z.string(),
  /** Evaluate this axis only when this holds (e.g. on a beta-blocker). */
  appliesWhen: ConditionSchema.optional(),
  /** Bands in evaluation order; the first true band wins. Either inline or a shared band set. */
  bands: z.array(BandSchema).optional(),
  bandSet: z.string().optional(),
  /** Peak-based axis: not assessable when effort is not shown to be maximal. */
  requiresMaximalEffort: z.boolean().optional(),
  inCombination: z.boolean().optional(),
  /** Cohort, for "published thresholds (study, population)". */
  population: z.string().optional(),
  ...Cited,
});

export const CombinationSchema = z.union([
  z.strictObject({ type: z.literal("none") }),
  z.strictObject({ type: z.literal("worst") }),
  z.strictObject({ type: z.literal("choice"), choice: z.string() }),
]);

export const SchemeSchema = z.strictObject({
  id: z.string(),
  name: z.string(),
  referrals: z.array(z.string()),
  /** Applied only when this choice has this option selected (alternative algorithms). */
  selectedBy: z.strictObject({ choice: z.string(), option: z.string() }).optional(),
  kind: z.enum(["bands", "graph"]),
  axes: z.array(AxisSchema).optional(),
  combination: CombinationSchema.optional(),
  graph: GraphSchema.optional(),
  notes: z.array(z.string()).optional(),
  ...Cited,
});

export const SchemesFileSchema = z.strictObject({
  $comment: z.string().optional(),
  bandSets: z.array(z.strictObject({ id: z.string(), variable: z.string(), bands: z.array(BandSchema).min(1) })),
  schemes: z.array(SchemeSchema).min(1),
});

export const VariabilitySchema = z.strictObject({
  id: z.string(),
  variable: VariableIdSchema,
  population: z.string(),
  populationLabel: z.string(),
  /**
   * absolute: noise band = value (unit of the variable);
   * cov-pct: within-subject CoV %, noise band = 1.96·√2·(CoV/100)·mean of both tests;
   * repeatability-pct: published coefficient of repeatability as % of the mean;
   * icc: reliability only, no noise band derivable without the study SD.
   */
  kind: z.enum(["absolute", "cov-pct", "repeatability-pct", "icc"]),
  value: z.number(),
  description: z.string(),
  ...Cited,
});

export const VariabilityFileSchema = z.strictObject({
  $comment: z.string().optional(),
  populations: z.array(z.strictObject({ id: z.string(), label: z.string() })),
  entries: z.array(VariabilitySchema),
});

export type ChoiceData = z.infer<typeof ChoiceSchema>;
export type RuleData = z.infer<typeof RuleSchema>;
export type DerivedData = z.infer<typeof DerivedSchema>;
export type NodeData = z.infer<typeof NodeSchema>;
export type GraphData = z.infer<typeof GraphSchema>;
export type BranchData = z.infer<typeof BranchSchema>;
export type FlowData = z.infer<typeof FlowFileSchema>;
export type EffortData = z.infer<typeof EffortFileSchema>;
export type PatternsData = z.infer<typeof PatternsFileSchema>;
export type PatternData = z.infer<typeof PatternSchema>;
export type BandData = z.infer<typeof BandSchema>;
export type AxisData = z.infer<typeof AxisSchema>;
export type SchemeData = z.infer<typeof SchemeSchema>;
export type SchemesData = z.infer<typeof SchemesFileSchema>;
export type VariabilityData = z.infer<typeof VariabilityFileSchema>;
export type VariabilityEntry = z.infer<typeof VariabilitySchema>;
