import { buildRecord, type TestRecord } from "../../lib/analysis";
import { DEMO_CASES, demoCsv } from "../../lib/store/demoCases";

/** An INVENTED demo case (synthetic generator preset, fixed seed) as a test record, with its entered inputs. */
export async function demoRecord(presetId: string): Promise<TestRecord> {
  const demo = DEMO_CASES.find((d) => d.presetId === presetId)!;
  const bytes = new TextEncoder().encode(demoCsv(demo));
  const built = await buildRecord({
    bytes,
    fileName: demo.fileName,
    patient: demo.patient,
    ergometer: demo.ergometer,
    referral: demo.referral,
  });
  return Object.assign(built.record!, { spirometry: demo.spirometry, conduct: demo.conduct, context: demo.context });
}

/** The demo case's label as shown in the register. */
export function demoLabel(presetId: string): string {
  return DEMO_CASES.find((d) => d.presetId === presetId)!.label;
}
