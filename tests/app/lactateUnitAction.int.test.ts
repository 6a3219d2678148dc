/**
 * The lactate form's unit choice: a column of INVENTED mg/dL values (9.0 … 27.0, i.e. 1.0 … 3.0 mmol/L at 9.008 mg/dL
 * per mmol/L) with no unit in its header is ambiguous by magnitude (lowest ≥ 4.5, highest ≤ 30: `importLactateFile`
 * refuses it with a question); chosen as mg/dL on the form it is read and stored in mmol/L.
 */
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";

vi.mock("next/cache", () => ({ revalidatePath: () => undefined }));

import { addLactateFile } from "../../app/tests/[id]/inputs/actions";
import { closeDb } from "../../lib/store/db";
import { getTest, saveTest } from "../../lib/store/tests";
import { caseRecord } from "../fixtures/caseRecord";

let dir = "";
beforeEach(() => {
  closeDb();
  dir = fs.mkdtempSync(path.join(os.tmpdir(), "cpet-lactate-unit-"));
  process.env.CPET_DB = path.join(dir, "test.sqlite");
});
afterEach(() => {
  closeDb();
  fs.rmSync(dir, { recursive: true, force: true });
});

const CSV = ["work_w,lactate", "0,9.0", "100,11.7", "150,15.3", "200,21.6", "250,27.0"].join("\n");

/** The lactate form as the browser sends it (plain times in seconds). */
async function send(testId: number, lactateUnit: string, csv = CSV) {
  const form = new FormData();
  form.set("testId", String(testId));
  form.set("timeUnit", "s");
  form.set("lactateUnit", lactateUnit);
  form.set("file", new File([csv], "lactate.csv", { type: "text/csv" }));
  return addLactateFile({}, form);
}

describe("the lactate form's unit choice (invented samples)", () => {
  it("without a choice the ambiguous column is refused and nothing is stored; chosen as mg/dL it is stored in mmol/L", async () => {
    const testId = saveTest({
      uploadId: null,
      label: "Lactate unit (invented)",
      record: await caseRecord("normal-adult"),
      columns: [],
      issues: [],
    });
    const refused = await send(testId, "");
    expect(refused.ok).toBeUndefined();
    expect(getTest(testId)!.record!.lactate ?? []).toHaveLength(0);
    const read = await send(testId, "mg/dL");
    expect(read.ok).toMatch(/5 lactate sample\(s\) saved/);
    const stored = getTest(testId)!.record!.lactate!;
    expect(stored.map((s) => s.lactateMmolL)).toEqual([9.0, 11.7, 15.3, 21.6, 27.0].map((v) => expect.closeTo(v / 9.008, 6)));
    expect(read.values?.lactateUnit).toBe("mg/dL"); // kept on the form
  });
});

describe("the notes of a lactate file stay with the test (invented samples)", () => {
  it("a column read as mg/dL from its values keeps that note in the record; a later file replaces it", async () => {
    const testId = saveTest({
      uploadId: null,
      label: "Lactate notes (invented)",
      record: await caseRecord("normal-adult"),
      columns: [],
      issues: [],
    });
    const byValues = ["work_w,lactate", "0,9.0", "100,13.5", "150,22.5", "200,40.5", "250,61.3"].join("\n");
    expect((await send(testId, "", byValues)).ok).toMatch(/5 lactate sample\(s\) saved/);
    const kept = getTest(testId)!.record!.importIssues.filter((i) => i.where?.field === "lactateFile");
    expect(kept.length).toBeGreaterThan(0);
    expect(kept.map((i) => i.message).join(" ")).toMatch(/mg\/dL/);
    await send(testId, "mmol/L"); // the unit chosen: values 9–27 read as mmol/L, no note about reading the unit
    const after = getTest(testId)!.record!.importIssues.filter((i) => i.where?.field === "lactateFile");
    expect(after.map((i) => i.message).join(" ")).not.toMatch(/read as mg\/dL/);
  });
});
