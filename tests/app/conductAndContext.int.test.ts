/**
 * The test-conduct form's apparatus dead space: saved with the record, subtracted from VD/VT as VDapparatus/VT
 * (Bohr-Enghoff form with the apparatus term, recalled), refused outside 0–500 mL (our choice) with the typed value kept.
 * Data: the INVENTED normal-adult demo case with an INVENTED arterial sample at peak.
 */
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";

vi.mock("next/cache", () => ({ revalidatePath: () => undefined }));

import { saveConduct, saveContext } from "../../app/tests/[id]/inputs/actions";
import { analyse } from "../../lib/analysis";
import { closeDb } from "../../lib/store/db";
import { getTest, listAudit, saveTest } from "../../lib/store/tests";
import { caseRecord } from "../fixtures/caseRecord";

let dir = "";
beforeEach(() => {
  closeDb();
  dir = fs.mkdtempSync(path.join(os.tmpdir(), "cpet-dead-space-"));
  process.env.CPET_DB = path.join(dir, "test.sqlite");
});
afterEach(() => {
  closeDb();
  fs.rmSync(dir, { recursive: true, force: true });
});

async function send(testId: number, deadSpace: string, barometricPressure = "", token?: string) {
  const form = new FormData();
  form.set("testId", String(testId));
  // the version of the test's details the page showed (a fresh page: the current one)
  form.set("recordToken", token ?? getTest(testId)!.recordSha256!);
  form.set("protocol", "cycle ramp");
  form.set("apparatusDeadSpaceMl", deadSpace);
  form.set("barometricPressureMmHg", barometricPressure);
  return saveConduct({}, form);
}

describe("apparatus dead space on the test-conduct form (invented case)", () => {
  it("is saved and subtracted from peak VD/VT by VDapparatus/VT; an impossible value is refused and kept on the form", async () => {
    const record = { ...(await caseRecord("normal-adult")), bloodGases: [{ timeS: NaN, label: "peak", paCO2MmHg: 38 }] };
    const testId = saveTest({ uploadId: null, label: "Dead space (invented)", record, columns: [], issues: [] });
    const before = analyse(getTest(testId)!.record!, {}).indices.vdVt.find((p) => p.atPeak)!;
    expect(before.vdVt.value).not.toBeNull();

    const refused = await send(testId, "900");
    expect(refused.errors?.apparatusDeadSpaceMl).toMatch(/Apparatus dead space/);
    expect(refused.values?.apparatusDeadSpaceMl).toBe("900");
    expect(getTest(testId)!.record!.conduct?.apparatusDeadSpaceMl).toBeUndefined();

    const saved = await send(testId, "120");
    expect(saved.ok).toMatch(/saved/);
    const stored = getTest(testId)!.record!;
    expect(stored.conduct).toMatchObject({ protocol: "cycle ramp", apparatusDeadSpaceMl: 120 });
    const after = analyse(stored, {}).indices.vdVt.find((p) => p.atPeak)!;
    const vt = after.vtL!.value!;
    expect(vt).toBeGreaterThan(1); // a tidal volume near peak, L
    expect(after.vdVt.value!).toBeCloseTo(before.vdVt.value! - 0.12 / vt, 12);
  });

  it("barometric pressure moves P(A−a)O2 by FiO2 × the change (alveolar gas equation, common practice)", async () => {
    const record = {
      ...(await caseRecord("normal-adult")),
      bloodGases: [{ timeS: NaN, label: "peak", paCO2MmHg: 38, paO2MmHg: 92 }],
    };
    const testId = saveTest({ uploadId: null, label: "Barometric pressure (invented)", record, columns: [], issues: [] });
    const seaLevel = analyse(getTest(testId)!.record!, {});
    const at760 = seaLevel.indices.vdVt.find((p) => p.atPeak)!.aaGradient!.value!;
    expect(seaLevel.issues.map((i) => i.code)).toContain("aa-gradient-sea-level");
    expect((await send(testId, "", "300")).errors?.barometricPressureMmHg).toMatch(/Barometric pressure/);
    expect((await send(testId, "", "700")).ok).toMatch(/saved/);
    const high = analyse(getTest(testId)!.record!, {});
    // PAO2 falls by 0.2093 × (760 − 700) = 12.56 mmHg; PaO2, PaCO2 and R are unchanged
    expect(high.indices.vdVt.find((p) => p.atPeak)!.aaGradient!.value!).toBeCloseTo(at760 - 0.2093 * 60, 9);
    expect(high.issues.map((i) => i.code)).not.toContain("aa-gradient-sea-level");
  });

  it("the clinical context is noted in words in the audit trail, not as JSON (invented case)", async () => {
    const testId = saveTest({
      uploadId: null,
      label: "Context note (invented)",
      record: await caseRecord("normal-adult"),
      columns: [],
      issues: [],
    });
    const form = new FormData();
    form.set("testId", String(testId));
    form.set("recordToken", getTest(testId)!.recordSha256!);
    form.set("betaBlocker", "yes");
    form.set("atrialFibrillation", "no");
    form.set("stairClimbM", "22");
    expect((await saveContext({}, form)).ok).toMatch(/saved/);
    const note = listAudit(testId).find((a) => a.action === "clinical-context-updated")!.detail!;
    expect(note).toBe("stair climb (m) 22; beta-blocker yes; atrial fibrillation no");
    expect(getTest(testId)!.record!.patient).toMatchObject({ betaBlocker: true, atrialFibrillation: false });
  });

  it("a save from a page opened before another save is refused, keeping the typed values and the other save", async () => {
    const testId = saveTest({
      uploadId: null,
      label: "Two tabs (invented)",
      record: await caseRecord("normal-adult"),
      columns: [],
      issues: [],
    });
    const opened = getTest(testId)!.recordSha256!; // both tabs show this version
    expect((await send(testId, "120", "", opened)).ok).toMatch(/saved/); // tab A
    const b = await send(testId, "", "700", opened); // tab B, stale
    expect(b.errors?.form).toMatch(/changed elsewhere .* after this page was opened/);
    expect(b.values?.barometricPressureMmHg).toBe("700");
    expect(getTest(testId)!.record!.conduct).toMatchObject({ apparatusDeadSpaceMl: 120 });
    expect(getTest(testId)!.record!.conduct?.barometricPressureMmHg).toBeUndefined();
    // without a token the save is refused too (a page of an older build, or a hand-made request)
    const form = new FormData();
    form.set("testId", String(testId));
    form.set("protocol", "x");
    expect((await saveConduct({}, form)).errors?.form).toMatch(/did not say which version/);
  });
});
