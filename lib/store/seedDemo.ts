import "server-only";
import { buildRecord } from "../analysis";
import { DEMO_CASES, demoCsv } from "./demoCases";
import { countTests, saveTest, saveUpload } from "./tests";

let seeding: Promise<void> | null = null;

/** Seed the invented demo cases when the register is empty (first start). */
export function ensureDemoData(): Promise<void> {
  if (countTests() > 0) return Promise.resolve();
  seeding ??= (async () => {
    if (countTests() > 0) return;
    for (const demo of DEMO_CASES) {
      const bytes = new TextEncoder().encode(demoCsv(demo));
      const upload = saveUpload(demo.fileName, bytes);
      const built = await buildRecord({
        bytes,
        fileName: demo.fileName,
        sha256: upload.sha256,
        patient: demo.patient,
        ergometer: demo.ergometer,
        referral: demo.referral,
      });
      if (built.record)
        Object.assign(built.record, { spirometry: demo.spirometry, conduct: demo.conduct, context: demo.context });
      saveTest({
        uploadId: upload.id,
        label: demo.label,
        record: built.record,
        columns: built.columns,
        issues: built.issues,
        demo: true,
      });
    }
  })();
  return seeding;
}
