import { z } from "zod";
import { PREDICTED_QUANTITIES, PREDICTED_QUANTITY_IDS, type PredictedQuantity } from "./quantities";

/**
 * Runtime schema of a reference-equation data file (`reference-equations/<id>.json`).
 * `reference-equations/schema.json` is the same contract written as JSON Schema for editors and
 * reviewers; a test checks both accept and refuse the same files.
 *
 * The `form` is a small declarative expression tree (numbers, predictor names, sums, products,
 * branches by sex / ergometer / weight rule, named intermediate values, post-multipliers and unit
 * conversions). It is evaluated by a fixed interpreter: no code in strings, no eval.
 */

/** A predictor or intermediate name: letters, digits, underscore; starts with a letter. */
const NAME = /^[A-Za-z][A-Za-z0-9_]*$/;
const name = z.string().regex(NAME);

export type Expr =
  | { const: number; label?: string }
  | { var: string }
  | { linear: { intercept: number; terms: { coef: number; vars: string[] }[] } }
  | { sum: Expr[] }
  | { difference: [Expr, Expr] }
  | { product: Expr[] }
  | { quotient: { numerator: Expr; denominator: Expr } }
  | { scale: { of: Expr; operation: "multiply" | "divide"; factor: number; label: string } }
  | { let: { define: { name: string; label: string; unit?: string; expr: Expr }[]; in: Expr } }
  | { bySex: { male?: Expr; female?: Expr } }
  | { byErgometer: { cycle?: Expr; treadmill?: Expr } }
  | { compare: { label: string; left: Expr; right: Expr; equalWithin: number; equal: Expr; greater: Expr; less: Expr } }
  | { ref: { equation?: string; quantity?: PredictedQuantity; unit: string } };

export const ExprSchema: z.ZodType<Expr> = z.lazy(() =>
  z.union([
    z.strictObject({ const: z.number(), label: z.string().optional() }),
    z.strictObject({ var: name }),
    z.strictObject({
      linear: z.strictObject({
        intercept: z.number(),
        terms: z.array(z.strictObject({ coef: z.number(), vars: z.array(name).min(1) })).min(1),
      }),
    }),
    z.strictObject({ sum: z.array(ExprSchema).min(1) }),
    z.strictObject({ difference: z.tuple([ExprSchema, ExprSchema]) }),
    z.strictObject({ product: z.array(ExprSchema).min(1) }),
    z.strictObject({ quotient: z.strictObject({ numerator: ExprSchema, denominator: ExprSchema }) }),
    z.strictObject({
      scale: z.strictObject({
        of: ExprSchema,
        operation: z.enum(["multiply", "divide"]),
        factor: z.number().positive(),
        label: z.string().min(1),
      }),
    }),
    z.strictObject({
      let: z.strictObject({
        define: z.array(z.strictObject({ name, label: z.string().min(1), unit: z.string().optional(), expr: ExprSchema })).min(1),
        in: ExprSchema,
      }),
    }),
    z.strictObject({ bySex: z.strictObject({ male: ExprSchema.optional(), female: ExprSchema.optional() }) }),
    z.strictObject({
      byErgometer: z.strictObject({ cycle: ExprSchema.optional(), treadmill: ExprSchema.optional() }),
    }),
    z.strictObject({
      compare: z.strictObject({
        label: z.string().min(1),
        left: ExprSchema,
        right: ExprSchema,
        equalWithin: z.number().nonnegative(),
        equal: ExprSchema,
        greater: ExprSchema,
        less: ExprSchema,
      }),
    }),
    z.strictObject({
      ref: z.strictObject({
        equation: z.string().optional(),
        quantity: z.enum(PREDICTED_QUANTITY_IDS as [PredictedQuantity, ...PredictedQuantity[]]).optional(),
        unit: z.string(),
      }),
    }),
  ]),
);

const RangeSchema = z.strictObject({ min: z.number().optional(), max: z.number().optional() });
const RangesSchema = z.strictObject({
  ageY: RangeSchema.optional(),
  heightCm: RangeSchema.optional(),
  weightKg: RangeSchema.optional(),
  bmi: RangeSchema.optional(),
});

export const PREDICTOR_INPUTS = ["sex", "ageY", "heightCm", "weightKg", "ergometer", "fev1L", "workPeakW"] as const;
export type PredictorInput = (typeof PREDICTOR_INPUTS)[number];

const PredictorSchema = z.strictObject({
  name,
  from: z.enum(PREDICTOR_INPUTS),
  unit: z.string(),
  label: z.string().min(1),
  /** Categorical coding, e.g. `{ "male": 0, "female": 1 }` or `{ "treadmill": 1, "cycle": 2 }`. */
  coding: z.partialRecord(z.enum(["male", "female", "cycle", "treadmill"]), z.number()).optional(),
  /** Unit conversion from the engine's unit to the paper's, e.g. kg × 2.20462 = lb. */
  convert: z
    .strictObject({ operation: z.enum(["multiply", "divide"]), factor: z.number().positive(), basis: z.string().min(1) })
    .optional(),
});

const SourceSchema = z.strictObject({
  authors: z.string().min(1),
  year: z.number().int(),
  title: z.string().min(1),
  journal: z.string().min(1),
  volume: z.string().optional(),
  issue: z.string().optional(),
  pages: z.string().optional(),
  doi: z.string().optional(),
  pmid: z.string().optional(),
  /** Where in the publication: table, page, abstract. */
  locator: z.string().min(1),
  /** The text actually seen (primary abstract, secondary reproduction) and what stays unverified. */
  seenIn: z.string().min(1),
});

const LlnSchema = z.union([
  z.strictObject({
    method: z.literal("see"),
    /** Standard error of the estimate, in `unit`. */
    see: z.number().positive(),
    unit: z.string(),
    /** One-sided normal quantile; 1.645 gives the 5th percentile. */
    z: z.number().positive(),
    label: z.string().min(1),
  }),
  z.strictObject({ method: z.literal("formula"), form: ExprSchema, label: z.string().min(1) }),
]);

const CheckInputsSchema = z.strictObject({
  sex: z.enum(["male", "female"]).optional(),
  ageY: z.number().optional(),
  heightCm: z.number().optional(),
  weightKg: z.number().optional(),
  ergometer: z.enum(["cycle", "treadmill"]),
  fev1L: z.number().optional(),
  workPeakW: z.number().optional(),
});

const CheckValueSchema = z.strictObject({
  inputs: CheckInputsSchema,
  /** Equation choices for `ref` by quantity (otherwise the lab defaults). */
  labSettings: z.record(z.string(), z.record(z.string(), z.string())).optional(),
  expected: z.number(),
  tolerance: z.number().positive(),
  expectedLln: z.number().optional(),
  /** Where the expected value comes from, with the arithmetic for a hand calculation. */
  origin: z.string().min(20),
});

export const EQUATION_KINDS = ["predicted-normal", "derived-predicted", "capacity-estimate", "performance-estimate"] as const;
export type EquationKind = (typeof EQUATION_KINDS)[number];

export const ReferenceEquationSchema = z
  .strictObject({
    $schema: z.string().optional(),
    id: z.string().regex(/^[a-z0-9]+(-[a-z0-9]+)*$/),
    /**
     * predicted-normal: a reference value for a healthy person like the patient;
     * derived-predicted: built from other predicted values (e.g. O2 pulse = VO2 ÷ HR);
     * capacity-estimate: the patient's own capacity estimated from another measurement (MVV from FEV1);
     * performance-estimate: converts what the patient achieved (watts) into VO2 — never a predicted normal.
     */
    kind: z.enum(EQUATION_KINDS),
    label: z.string().min(1),
    quantity: z.enum(PREDICTED_QUANTITY_IDS as [PredictedQuantity, ...PredictedQuantity[]]),
    unit: z.string(),
    ergometer: z.enum(["cycle", "treadmill", "both"]),
    population: RangesSchema.extend({
      cohort: z.string().min(1),
      n: z.number().int().positive().optional(),
      sexes: z.array(z.enum(["male", "female"])).min(1),
      bySex: z.strictObject({ male: RangesSchema.optional(), female: RangesSchema.optional() }).optional(),
    }).strict(),
    predictors: z.array(PredictorSchema),
    form: ExprSchema,
    lln: LlnSchema.optional(),
    source: SourceSchema,
    status: z.enum(["confirmed", "secondary", "recalled"]),
    transcribedFrom: z.string().min(1),
    notes: z.array(z.string()),
    checkValues: z.array(CheckValueSchema).min(1),
  })
  .refine((e) => PREDICTED_QUANTITIES[e.quantity].unit === e.unit, {
    message: "unit must be the quantity's unit",
    path: ["unit"],
  });

export type ReferenceEquation = z.infer<typeof ReferenceEquationSchema>;
export type EquationPredictor = ReferenceEquation["predictors"][number];
export type EquationCheckValue = ReferenceEquation["checkValues"][number];
export type EquationStatus = ReferenceEquation["status"];
