import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import type { TestRecord } from "../../lib/analysis";
import { importBreathFile, type ColumnMapping } from "../../lib/breath";
import { closeDb, getDb } from "../../lib/store/db";
import { deleteProfile, getProfile, listProfiles, saveProfile } from "../../lib/store/profiles";
import { getImportChoices, recordImportChoices, replaceImport } from "../../lib/store/reimport";
import { getTest, listAudit, saveTest } from "../../lib/store/tests";

let dir = "";

beforeEach(() => {
  closeDb();
  dir = fs.mkdtempSync(path.join(os.tmpdir(), "cpet-profiles-"));
  process.env.CPET_DB = path.join(dir, "test.sqlite");
});
afterEach(() => {
  closeDb();
  fs.rmSync(dir, { recursive: true, force: true });
});

const mapping: ColumnMapping = Object.freeze({
  "Zeitpunkt (s)": Object.freeze({ field: "timeS" as const, unit: "s" }),
  Sauerstoff: Object.freeze({ field: "vo2MlMin" as const, unit: "L/min" }),
  Kommentar: Object.freeze({ field: null }),
}) as ColumnMapping;

describe("mapping profiles in the store (SQLite file)", () => {
  it("saves, lists, reads back and deletes a profile without changing the mapping", () => {
    const saved = saveProfile({ name: "  Lab cart, ramp layout ", mapping });
    expect(saved.ok).toBe(true);
    if (!saved.ok) return;
    // The name is stored trimmed; the mapping round-trips unchanged (deep equality with the frozen input).
    expect(saved.profile.name).toBe("Lab cart, ramp layout");
    expect(getProfile("Lab cart, ramp layout")?.mapping).toEqual(mapping);
    expect(listProfiles().map((p) => p.name)).toEqual(["Lab cart, ramp layout"]);
    expect(Number.isNaN(Date.parse(listProfiles()[0].createdAt))).toBe(false);
    expect(deleteProfile("Lab cart, ramp layout")).toBe(true);
    expect(getProfile("Lab cart, ramp layout")).toBeNull();
    expect(deleteProfile("Lab cart, ramp layout")).toBe(false);
    expect(listProfiles()).toEqual([]);
  });

  it("survives closing and reopening the database file", () => {
    saveProfile({ name: "kept", mapping });
    closeDb();
    expect(getProfile("kept")?.mapping).toEqual(mapping);
  });

  it("refuses a taken name (any letter case) with a clear message and keeps the first profile", () => {
    expect(saveProfile({ name: "Ramp", mapping }).ok).toBe(true);
    const again = saveProfile({ name: "ramp", mapping: { Other: { field: "hrBpm" } } });
    expect(again).toMatchObject({ ok: false, reason: "name-taken" });
    if (!again.ok) expect(again.message).toMatch(/already exists/);
    expect(listProfiles()).toHaveLength(1);
    expect(getProfile("Ramp")?.mapping).toEqual(mapping);
  });

  it("refuses invalid profiles (empty name, unknown field, empty mapping) without throwing", () => {
    expect(saveProfile({ name: "   ", mapping })).toMatchObject({ ok: false, reason: "invalid" });
    const badField = { name: "x", mapping: { A: { field: "heartbeat" } } } as unknown as Parameters<typeof saveProfile>[0];
    expect(saveProfile(badField)).toMatchObject({ ok: false, reason: "invalid" });
    expect(saveProfile({ name: "nothing", mapping: {} })).toMatchObject({ ok: false, reason: "empty" });
    expect(listProfiles()).toEqual([]);
  });

  it("skips a stored row whose mapping is no longer valid instead of failing the list", () => {
    saveProfile({ name: "good", mapping });
    getDb()
      .prepare("insert into mapping_profiles (name, mapping_json, created_at) values (?, ?, ?)")
      .run("broken", '{"A":{"field":"nonsense"}}', new Date().toISOString());
    expect(listProfiles().map((p) => p.name)).toEqual(["good"]);
    expect(getProfile("broken")).toBeNull();
  });

  it("a saved profile applied to the next file of the same layout marks its columns as set by the user", async () => {
    // INVENTED synthetic file: three columns whose names the importer does not know; VO2 0.50 → 0.89 L/min.
    const lines = ["Zeitpunkt (s),Sauerstoff,Kommentar"];
    for (let i = 0; i < 40; i++) lines.push(`${i * 5},${(0.5 + i * 0.01).toFixed(2)},note`);
    const text = lines.join("\n");
    saveProfile({ name: "layout", mapping });
    const result = await importBreathFile(new TextEncoder().encode(text), { mapping: getProfile("layout")!.mapping });
    const vo2 = result.columns.find((c) => c.header === "Sauerstoff")!;
    expect(vo2).toMatchObject({ field: "vo2MlMin", decidedBy: "user" });
    // Last row: 0.5 + 39 × 0.01 = 0.89 L/min × 1000 = 890 mL/min (unit set by the profile).
    expect(result.table?.rows.at(-1)?.vo2MlMin).toBeCloseTo(890, 9);
    expect(result.columns.find((c) => c.header === "Kommentar")).toMatchObject({ field: null, decidedBy: "user" });
  });
});

describe("re-reading a kept file with new choices", () => {
  const record = (rows: number): TestRecord =>
    ({
      patient: { weightKg: 70 },
      ergometer: "cycle",
      referral: "general",
      table: { shape: "breath", rows: Array.from({ length: rows }, (_, i) => ({ timeS: i * 5, vo2MlMin: 1000 })) },
      columns: [],
      importIssues: [],
    }) as unknown as TestRecord;

  it("turns a refused test into an imported one and keeps the choices and the audit trail", () => {
    const id = saveTest({ uploadId: null, label: "Refused (invented)", record: null, columns: [], issues: [] });
    expect(getTest(id)?.status).toBe("refused");
    const choices = { mapping, select: { ID: "2" }, weightKg: 70 };
    expect(replaceImport(id, { record: record(12), columns: [], issues: [], choices, actor: "tester" })).toBe(true);
    const t = getTest(id)!;
    expect(t.status).toBe("imported");
    expect(t.record?.table.rows).toHaveLength(12);
    expect(getImportChoices(id)).toEqual(choices);
    const actions = listAudit(id).map((a) => a.action);
    expect(actions).toEqual(["import-re-read", "test-refused"]);
    expect(listAudit(id)[0].detail).toContain("3 column(s) set by user");
    expect(listAudit(id)[0].detail).toContain("12 rows read");
  });

  it("records the profile an upload was read with, and reports an unknown test", () => {
    const id = saveTest({ uploadId: null, label: "Uploaded (invented)", record: record(3), columns: [], issues: [] });
    expect(getImportChoices(id)).toBeNull();
    recordImportChoices(id, { mapping, profileName: "layout" });
    expect(getImportChoices(id)).toMatchObject({ mapping, profileName: "layout" });
    // The column decisions saved with the test are untouched by recording the choices.
    expect(getTest(id)?.importColumns).toEqual([]);
    expect(listAudit(id).map((a) => a.action)).toContain("mapping-profile-applied");
    expect(replaceImport(99999, { record: null, columns: [], issues: [], choices: { mapping: {} }, actor: "x" })).toBe(false);
  });
});
