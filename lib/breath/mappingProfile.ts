import { z } from "zod";
import { NUMERIC_FIELDS, type NumericField } from "./types";

/** One user decision for one header: which canonical field it feeds (null = ignore) and, optionally, its unit. */
export interface ColumnOverride {
  field: NumericField | "phase" | null;
  /** Unit as written by the user, e.g. "L/min", "mL/kg/min", "kPa", "min", "mm:ss". */
  unit?: string;
}

/** Header text (as in the file) → decision. */
export type ColumnMapping = Record<string, ColumnOverride>;

/** A named, reusable mapping (plain data the store can save and apply to the next file of the same layout). */
export interface MappingProfile {
  name: string;
  mapping: ColumnMapping;
}

export const columnOverrideSchema = z.object({
  field: z.enum([...NUMERIC_FIELDS, "phase"]).nullable(),
  unit: z.string().min(1).optional(),
});

export const columnMappingSchema = z.record(z.string(), columnOverrideSchema);

/** zod schema for `MappingProfile` (use `safeParse` on stored or posted profiles). */
export const mappingProfileSchema = z.object({
  name: z.string().trim().min(1),
  mapping: columnMappingSchema,
});
