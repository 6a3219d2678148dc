/**
 * The test page's settings form builds a new analysis version from the latest one: a page opened before another save
 * must not silently put its old values back. Data: the INVENTED normal-adult demo case.
 */
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";

vi.mock("next/cache", () => ({ revalidatePath: () => undefined }));

import { saveSettings } from "../../app/tests/[id]/actions";
import { closeDb } from "../../lib/store/db";
import { latestSettings, listAnalysisVersions, saveAnalysisVersion, saveTest } from "../../lib/store/tests";
import { caseRecord } from "../fixtures/caseRecord";

let dir = "";
beforeEach(() => {
  closeDb();
  dir = fs.mkdtempSync(path.join(os.tmpdir(), "cpet-stale-settings-"));
  process.env.CPET_DB = path.join(dir, "test.sqlite");
});
afterEach(() => {
  closeDb();
  fs.rmSync(dir, { recursive: true, force: true });
});

function settingsForm(testId: number, token: string, peakWindowS: string, averaging: string) {
  const f = new FormData();
  for (const [k, v] of Object.entries({
    testId: String(testId),
    versionToken: token,
    averaging,
    peakWindowS,
    vo2Equation: "hansen-1984",
    hrEquation: "ers-2019-hrmax-cycle",
    mvvChoice: "auto",
  }))
    f.set(k, v);
  return f;
}

describe("the settings form of a stale page (invented case)", () => {
  it("is refused with the typed values kept; the other tab's change stays", async () => {
    const testId = saveTest({
      uploadId: null,
      label: "Stale settings (invented)",
      record: await caseRecord("normal-adult"),
      columns: [],
      issues: [],
    });
    saveAnalysisVersion(testId, {}, "0.0.0-test", "tester");
    const opened = String(latestSettings(testId)!.id); // both tabs show this version
    const a = await saveSettings({}, settingsForm(testId, opened, "20", "none")); // tab A: peak window 20 s
    expect(a.ok).toMatch(/new analysis version/);
    const b = await saveSettings({}, settingsForm(testId, opened, "30", "rolling-30")); // tab B, stale
    expect(b.errors?.form).toMatch(/a new analysis version of this test was made elsewhere/);
    expect(b.values?.averaging).toBe("rolling-30");
    expect(latestSettings(testId)!.settings.peakWindowS).toBe(20);
    expect(listAnalysisVersions(testId)).toHaveLength(2);
    // from the page that saw tab A's version it goes through
    const c = await saveSettings({}, settingsForm(testId, String(latestSettings(testId)!.id), "30", "rolling-30"));
    expect(c.ok).toMatch(/new analysis version/);
  });
});
