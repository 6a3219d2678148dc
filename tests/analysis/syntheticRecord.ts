import type { TestRecord } from "../../lib/analysis";
import { DEFAULT_SYNTHETIC_SPEC, generateSyntheticTest, type SyntheticSpec, type SyntheticTest } from "../../lib/synthetic";

/**
 * A test record around an INVENTED synthetic test (main model; spec fields over the default healthy adult), with
 * the generator's truth beside it so a test knows its answers by construction.
 */
export function syntheticRecord(over: Partial<SyntheticSpec>, seed: number): { record: TestRecord; syn: SyntheticTest } {
  const syn = generateSyntheticTest({ ...DEFAULT_SYNTHETIC_SPEC, ...over }, seed);
  const record: TestRecord = {
    patient: { sex: "male", ageY: 45, heightCm: 178, weightKg: 75 },
    ergometer: "cycle",
    referral: "general",
    table: syn.table,
    columns: [],
    importIssues: [],
  };
  return { record, syn };
}
