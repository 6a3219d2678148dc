/**
 * The upload action and the file-size check it shares with the form in the browser: an empty file and an oversize file
 * are refused with words that name the file and its size, a refused upload returns every field as sent (selects
 * included) with a new attempt number, and a file kept from an earlier submit stays kept. Files and patients are INVENTED.
 */
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { uploadTest } from "../../app/actions";
import {
  formatFileSize,
  MAX_UPLOAD_BYTES,
  MAX_UPLOAD_WORDS,
  testDetailsSchema,
  UPLOAD_BODY_LIMIT_BYTES,
  uploadFileProblem,
} from "../../app/schemas";
import nextConfig from "../../next.config";
import { closeDb } from "../../lib/store/db";
import { getTest } from "../../lib/store/tests";
import { getImportChoices } from "../../lib/store/reimport";

let dir = "";
beforeEach(() => {
  closeDb();
  dir = fs.mkdtempSync(path.join(os.tmpdir(), "cpet-upload-"));
  process.env.CPET_DB = path.join(dir, "test.sqlite");
});
afterEach(() => {
  closeDb();
  fs.rmSync(dir, { recursive: true, force: true });
});

/** INVENTED ramp, one row every 3 s: VO2 500 → 2500 mL/min over 600 s. */
function rampCsv(): string {
  const lines = ["time_s,vo2_ml_min,vco2_ml_min,ve_l_min,hr_bpm,work_w"];
  for (let t = 0; t <= 660; t += 3) {
    const vo2 = t <= 600 ? 500 + (2000 * t) / 600 : 2500;
    lines.push(
      `${t},${vo2.toFixed(1)},${(vo2 * 0.95).toFixed(1)},${((vo2 * 28) / 1000 + 3).toFixed(2)},${Math.round(70 + vo2 / 25)},${Math.round(Math.min(t, 600) / 3)}`,
    );
  }
  return lines.join("\n") + "\n";
}

/** The form as the browser sends it: every field a string, the file input a File (nameless and empty when none chosen). */
function form(file: File | null, fields: Record<string, string> = {}): FormData {
  const fd = new FormData();
  fd.set("file", file ?? new File([], "", { type: "application/octet-stream" }));
  const all = {
    profile: "",
    label: "Invented case",
    sex: "female",
    ageY: "58",
    heightCm: "162",
    weightKg: "70",
    ergometer: "treadmill",
    referral: "heart-failure",
    fev1L: "2.4",
    mvvLMin: "",
    ...fields,
  };
  for (const [k, v] of Object.entries(all)) fd.set(k, v);
  return fd;
}

/** A file of `size` bytes without allocating them: the action must refuse it by its size before reading it. */
function fileOfSize(name: string, size: number): File {
  const f = new File(["x"], name, { type: "text/csv" });
  Object.defineProperty(f, "size", { value: size });
  return f;
}

/** The test id a successful upload redirects to (`redirect` throws NEXT_REDIRECT with the URL in its digest). */
async function redirectedTestId(run: Promise<unknown>): Promise<number> {
  const err = (await run.then(
    () => null,
    (e: unknown) => e,
  )) as { digest?: string } | null;
  const m = /\/tests\/(\d+)/.exec(err?.digest ?? "");
  if (!m) throw new Error(`no redirect to a test: ${String(err)}`);
  return Number(m[1]);
}

describe("formatFileSize and uploadFileProblem", () => {
  it("gives sizes in plain words with KB and MB of 1024 bytes", () => {
    expect(formatFileSize(0)).toBe("0 bytes");
    expect(formatFileSize(1)).toBe("1 byte");
    expect(formatFileSize(1023)).toBe("1023 bytes");
    expect(formatFileSize(1024)).toBe("1.0 KB");
    expect(formatFileSize(3 * 1024 * 1024)).toBe("3.0 MB");
    // 21 × 1048576 = 22020096 bytes
    expect(formatFileSize(22_020_096)).toBe("21.0 MB");
  });

  it("gives the exact bytes when a size just over the limit would read as the limit", () => {
    // 20 × 1048576 + 1 = 20971521 bytes, which rounds to "20.0 MB"
    expect(formatFileSize(MAX_UPLOAD_BYTES + 1)).toBe("20.0 MB (20,971,521 bytes)");
  });

  it("keeps the limit at 20 MB and the body limit 1 MB above it", () => {
    expect(MAX_UPLOAD_BYTES).toBe(20 * 1024 * 1024);
    expect(MAX_UPLOAD_WORDS).toBe("20 MB");
    expect(UPLOAD_BODY_LIMIT_BYTES).toBe(21 * 1024 * 1024);
    expect(nextConfig.experimental?.serverActions?.bodySizeLimit).toBe(UPLOAD_BODY_LIMIT_BYTES);
  });

  it("names an empty file and says 0 bytes", () => {
    const msg = uploadFileProblem({ name: "empty.csv", size: 0 });
    expect(msg).toContain("empty.csv is empty (0 bytes)");
    expect(msg).not.toMatch(/^Choose/);
  });

  it("accepts a 1-byte file and a file exactly at the limit; refuses one byte more", () => {
    expect(uploadFileProblem({ name: "a.csv", size: 1 })).toBeNull();
    expect(uploadFileProblem({ name: "a.csv", size: MAX_UPLOAD_BYTES })).toBeNull();
    const msg = uploadFileProblem({ name: "a.csv", size: MAX_UPLOAD_BYTES + 1 });
    expect(msg).toContain("a.csv is 20.0 MB (20,971,521 bytes), larger than the 20 MB limit");
  });

  it("names the file, its size and the limit for a 21 MB file", () => {
    expect(uploadFileProblem({ name: "huge.csv", size: 22_020_096 })).toContain(
      "huge.csv is 21.0 MB, larger than the 20 MB limit",
    );
  });
});

describe("uploadTest refusals keep every field", () => {
  it("an empty file: says the named file is empty and returns the selects as chosen", async () => {
    const fd = form(new File([], "empty.csv", { type: "text/csv" }));
    const state = await uploadTest({}, fd);
    expect(state.errors?.file).toContain("The chosen file empty.csv is empty (0 bytes)");
    expect(state.uploadId).toBeUndefined();
    expect(state.values).toMatchObject({
      sex: "female",
      ergometer: "treadmill",
      referral: "heart-failure",
      ageY: "58",
      fev1L: "2.4",
      label: "Invented case",
    });
    expect(state.attempt).toBe(1);
  });

  it("no file chosen: asks for one", async () => {
    const state = await uploadTest({ attempt: 3 }, form(null));
    expect(state.errors?.file).toBe("Choose a breath-by-breath or stage file to upload.");
    expect(state.values?.ergometer).toBe("treadmill");
    expect(state.attempt).toBe(4);
  });

  it('no file chosen, as the page\'s script sends it (an empty part whose name reads back as "undefined")', async () => {
    const state = await uploadTest({}, form(new File([], "undefined")));
    expect(state.errors?.file).toBe("Choose a breath-by-breath or stage file to upload.");
  });

  it("an oversize file: refused by its size on the server too, with the limit named", async () => {
    const state = await uploadTest({}, form(fileOfSize("huge.csv", 22_020_096)));
    expect(state.errors?.file).toContain("huge.csv is 21.0 MB, larger than the 20 MB limit");
    expect(state.values).toMatchObject({ sex: "female", ergometer: "treadmill", referral: "heart-failure" });
  });

  it("invalid details keep the file and every field; a later empty file does not drop the kept one", async () => {
    const first = await uploadTest({}, form(new File([rampCsv()], "ramp.csv", { type: "text/csv" }), { ageY: "400" }));
    expect(first.errors?.ageY).toBe("Age (years) must be at most 110");
    expect(first.uploadId).toBeGreaterThan(0);
    expect(first.fileName).toBe("ramp.csv");
    expect(first.values).toMatchObject({ sex: "female", ergometer: "treadmill", referral: "heart-failure", ageY: "400" });

    const again = form(new File([], "empty.csv"), { ageY: "58" });
    again.set("uploadId", String(first.uploadId));
    again.set("uploadFileName", "ramp.csv");
    const second = await uploadTest(first, again);
    expect(second.errors?.file).toContain("empty.csv is empty (0 bytes)");
    expect(second.uploadId).toBe(first.uploadId);
    expect(second.fileName).toBe("ramp.csv");
    expect(second.attempt).toBe(2);
  });

  it("a good upload is imported with the chosen ergometer and referral", async () => {
    const id = await redirectedTestId(uploadTest({}, form(new File([rampCsv()], "ramp.csv", { type: "text/csv" }))));
    const test = getTest(id);
    expect(test?.record?.ergometer).toBe("treadmill");
    expect(test?.record?.referral).toBe("heart-failure");
    expect(test?.record?.patient.sex).toBe("female");
  });
});

describe("testDetailsSchema", () => {
  it("reads the upload form's select values", () => {
    const d = testDetailsSchema.parse({ sex: "female", ergometer: "treadmill", referral: "pre-operative" });
    expect(d).toMatchObject({ sex: "female", ergometer: "treadmill", referral: "pre-operative" });
  });

  it("a stage table without a time column is read at the stage length given on the form, kept for a re-read", async () => {
    // INVENTED stage table: five 3-min stages, no time column
    const csv = ["stage,work_w,vo2_ml_min,vco2_ml_min,ve_l_min,hr_bpm", "1,50,900,780,24,95", "2,100,1400,1250,35,115"]
      .concat(["3,150,1900,1780,48,135", "4,200,2400,2350,66,155", "5,250,2850,2950,90,172"])
      .join("\n");
    const file = new File([csv + "\n"], "stages (invented).csv", { type: "text/csv" });
    const id = await redirectedTestId(uploadTest({}, form(file, { stageDurationS: "180" })));
    const test = getTest(id)!;
    expect(test.record!.table.rows.map((r) => r.timeS)).toEqual([0, 180, 360, 540, 720]);
    const note = test.importIssues.find((i) => i.code === "time-assumed-stage-order")!;
    expect([note.severity, note.message]).toEqual([
      "info",
      "The file has no time column; its 5 rows were read as consecutive stages 180 s apart, the stage length given.",
    ]);
    expect(getImportChoices(id)?.stageDurationS).toBe(180);
    // out of the limits shared with the columns page (10–3600 s): refused, the file kept
    const bad = await uploadTest({}, form(new File([csv + "\n"], "stages (invented).csv"), { stageDurationS: "5" }));
    expect(bad.errors?.stageDurationS).toMatch(/Stage length \(s\) must be at least 10/);
    expect(bad.uploadId).toBeGreaterThan(0);
  });
});
