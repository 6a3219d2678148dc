/**
 * The audit trail (lib/store/auditTrail.ts, migration 9): each entry's time is the database clock's and a backdated one
 * is refused; entries are hash-chained, so an entry changed, removed or slipped in with raw SQL (after dropping the
 * triggers, as someone with the file could) is found at its id; a database made before the chain is chained by the
 * migration and verifies. SQLite in memory or in a temporary file; actors, tests and details are INVENTED.
 */
import { createHash } from "node:crypto";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { AUDIT_GENESIS, auditChainHash } from "../../lib/store/auditChain";
import {
  AUDIT_GUARDS,
  auditAtMostEvery,
  auditTrailStatus,
  missingAuditGuards,
  verifyAuditChain,
} from "../../lib/store/auditTrail";
import { closeDb, getDb } from "../../lib/store/db";
import { databaseAtMigration } from "../fixtures/databaseAtMigration";
import { audit, listAudit } from "../../lib/store/tests";
import { auditTrailWarning } from "../../app/auditTrailWarning";

type Row = {
  id: number;
  at: string;
  actor: string | null;
  action: string;
  test_id: number | null;
  detail: string | null;
  hash: string;
};
const rows = (db = getDb()) => db.prepare("select * from audit order by id").all() as Row[];

/** Five entries written the app's way. */
function writeFive() {
  audit("jdoe", "log-in", null, null);
  audit("jdoe", "test-imported", 1, "Case A (invented)");
  audit("jdoe", "test-renamed", 1, "“Case A (invented)” → “Case B (invented)”");
  audit(null, "analysis-version", 1, "v1");
  audit("cli:operator", "account-created", null, "asmith (Dr A Smith (invented), physiologist)");
}

/** What someone with the database file and another SQLite tool can do: drop the guards. */
function dropGuards(db = getDb()) {
  for (const t of AUDIT_GUARDS) db.exec(`drop trigger if exists ${t}`);
}

describe("audit trail (SQLite in memory)", () => {
  beforeEach(() => {
    process.env.CPET_DB = ":memory:";
    closeDb();
  });
  afterEach(() => closeDb());

  it("chains each entry from the genesis value: SHA-256 over the JSON of [previous hash, id, at, actor, action, test id, detail]", () => {
    writeFive();
    const all = rows();
    expect(all.map((r) => r.id)).toEqual([1, 2, 3, 4, 5]);
    // the first entry, hashed by hand from its stored fields
    const first = all[0];
    const byHand = createHash("sha256")
      .update(`["${"0".repeat(64)}",1,"${first.at}","jdoe","log-in",null,null]`, "utf8")
      .digest("hex");
    expect(first.hash).toBe(byHand);
    // each later entry chains from the one before it
    for (let i = 1; i < all.length; i++) {
      const r = all[i];
      expect(r.hash).toBe(auditChainHash(all[i - 1].hash, { ...r, testId: r.test_id }));
    }
    expect(verifyAuditChain()).toEqual({ ok: true, rows: 5 });
    expect(missingAuditGuards()).toEqual([]);
  });

  it("takes each entry's time from the database clock, in the form Date.toISOString() gives", () => {
    const before = Date.now();
    audit("jdoe", "log-in", null, null);
    const after = Date.now();
    const { at } = rows()[0];
    expect(at).toMatch(/^\d{4}-\d\d-\d\dT\d\d:\d\d:\d\d\.\d{3}Z$/);
    // the database and this process read the same system clock; SQLite keeps milliseconds
    expect(Date.parse(at)).toBeGreaterThanOrEqual(before - 1);
    expect(Date.parse(at)).toBeLessThanOrEqual(after + 1);
  });

  it("refuses a backdated, future-dated, oddly written or unhashed entry written with raw SQL", () => {
    writeFive();
    const db = getDb();
    const fakeHash = "a".repeat(64);
    const insert =
      (at: string | null, hash: string | null = fakeHash) =>
      () =>
        db
          .prepare("insert into audit (at, actor, action, test_id, detail, hash) values (?, 'jdoe', 'report-signed', 1, null, ?)")
          .run(at, hash);
    const hourAgo = new Date(Date.now() - 3_600_000).toISOString();
    expect(insert(hourAgo)).toThrow(/database clock/);
    expect(insert(new Date(Date.now() - 5_000).toISOString())).toThrow(/database clock/);
    expect(insert(new Date(Date.now() + 60_000).toISOString())).toThrow(/database clock/);
    expect(insert("yesterday")).toThrow(/database clock/);
    expect(insert(null)).toThrow();
    // the time now, in another form (no milliseconds): refused too, so times compare as text
    expect(insert(new Date().toISOString().slice(0, 19) + "Z")).toThrow(/database clock/);
    const dbNow = (db.prepare("select strftime('%Y-%m-%dT%H:%M:%fZ', 'now') as t").get() as { t: string }).t;
    expect(insert(dbNow, null)).toThrow(/chain hash/);
    expect(rows()).toHaveLength(5);
    expect(verifyAuditChain().ok).toBe(true);
  });

  it("finds an entry changed with raw SQL after the triggers were dropped, at that entry's id", () => {
    writeFive();
    const db = getDb();
    expect(() => db.prepare("update audit set detail = 'Case Z' where id = 3").run()).toThrow(/append-only/);
    dropGuards(db);
    db.prepare("update audit set actor = 'asmith' where id = 3").run();
    const check = verifyAuditChain();
    expect(check).toMatchObject({ ok: false, firstBrokenId: 3, rows: 3 });
    expect(check.reason).toContain("entry 3 does not fit the chain");
    expect(missingAuditGuards()).toEqual([...AUDIT_GUARDS]);
  });

  it("finds a removed entry at the entry after it, and one slipped in at its own id", () => {
    writeFive();
    const db = getDb();
    dropGuards(db);
    db.prepare("delete from audit where id = 2").run();
    expect(verifyAuditChain()).toMatchObject({ ok: false, firstBrokenId: 3 });

    closeDb();
    writeFive();
    dropGuards();
    // a backdated entry with a made-up hash
    const slip = (hash: string | null) =>
      getDb()
        .prepare(
          "insert into audit (at, actor, action, test_id, detail, hash) values ('2020-01-01T00:00:00.000Z', 'jdoe', 'report-signed', 1, null, ?)",
        )
        .run(hash);
    slip("b".repeat(64));
    expect(verifyAuditChain()).toMatchObject({ ok: false, firstBrokenId: 6, rows: 6 });

    closeDb();
    writeFive();
    dropGuards();
    slip(null);
    expect(verifyAuditChain()).toMatchObject({ ok: false, firstBrokenId: 6, reason: expect.stringContaining("no chain hash") });
  });

  it("cannot tell the newest entries removed from a shorter trail (a limit of a chain on its own: docs say so)", () => {
    writeFive();
    dropGuards();
    getDb().prepare("delete from audit where id >= 4").run();
    expect(verifyAuditChain()).toEqual({ ok: true, rows: 3 });
  });

  it("status for the masthead: checks everything once, then what was added; a break stays reported", () => {
    writeFive();
    expect(auditTrailStatus()).toEqual({ ok: true, rows: 5, missingGuards: [] });
    expect(auditTrailWarning()).toEqual([]);
    audit("jdoe", "log-out", null, null);
    expect(auditTrailStatus()).toMatchObject({ ok: true, rows: 6 });

    dropGuards();
    const dropped = auditTrailStatus();
    expect(dropped).toMatchObject({ ok: true, missingGuards: [...AUDIT_GUARDS] });
    expect(auditTrailWarning(dropped)).toEqual([
      expect.stringContaining("guards were removed from the database (audit_no_update"),
    ]);

    // an older entry changed while the app runs: seen by the full check (and at the next start), not by the cheap one
    getDb().prepare("update audit set detail = 'v2' where id = 4").run();
    expect(auditTrailStatus().ok).toBe(true);
    expect(verifyAuditChain()).toMatchObject({ ok: false, firstBrokenId: 4 });
    // the newest entry checked changed: the cheap check sees it
    getDb().prepare("update audit set actor = 'nobody' where id = 6").run();
    const broken = auditTrailStatus();
    expect(broken).toMatchObject({ ok: false, firstBrokenId: 6 });
    audit("jdoe", "log-in", null, null);
    expect(auditTrailStatus()).toMatchObject({ ok: false, firstBrokenId: 6 });
    expect(auditTrailWarning()[0]).toContain("The audit trail has been altered outside this app: entry 6 was changed or removed");
  });

  it("writes an entry done again and again at most once per actor and test within the window", () => {
    expect(auditAtMostEvery(10, "jdoe", "report-viewed", 1, "report 1")).toBe(true);
    expect(auditAtMostEvery(10, "jdoe", "report-viewed", 1, "report 1")).toBe(false);
    expect(auditAtMostEvery(10, "asmith", "report-viewed", 1, "report 1")).toBe(true);
    expect(auditAtMostEvery(10, "jdoe", "report-viewed", 2, "report 2")).toBe(true);
    expect(auditAtMostEvery(10, "local user", "report-viewed", 1, "report 1")).toBe(true);
    expect(auditAtMostEvery(10, "local user", "report-viewed", 1, "report 1")).toBe(false);
    expect(listAudit(1).map((e) => e.actor)).toEqual(["local user", "asmith", "jdoe"]);
    expect(verifyAuditChain()).toEqual({ ok: true, rows: 4 });
    expect(() => auditAtMostEvery(0, "jdoe", "report-viewed", 1, null)).toThrow();
  });

  it("writes an entry again once the earlier one is older than the window", () => {
    const db = getDb();
    // an entry 11 minutes old, chained properly: possible only with the time trigger lifted, as a test does here
    db.exec("drop trigger audit_time_and_hash");
    const at = new Date(Date.now() - 11 * 60_000).toISOString();
    const fields = { id: 1, at, actor: "jdoe", action: "report-viewed", testId: 1, detail: "report 1" };
    db.prepare(
      "insert into audit (id, at, actor, action, test_id, detail, hash) values (1, ?, 'jdoe', 'report-viewed', 1, 'report 1', ?)",
    ).run(at, auditChainHash(AUDIT_GENESIS, fields));
    expect(auditAtMostEvery(10, "jdoe", "report-viewed", 1, "report 1")).toBe(true);
    expect(auditAtMostEvery(10, "jdoe", "report-viewed", 1, "report 1")).toBe(false);
    expect(verifyAuditChain()).toEqual({ ok: true, rows: 2 });
  });
});

describe("a database made before the chain (temporary file)", () => {
  let dir = "";
  beforeEach(() => {
    closeDb();
    dir = fs.mkdtempSync(path.join(os.tmpdir(), "cpet-audit-chain-"));
  });
  afterEach(() => {
    closeDb();
    fs.rmSync(dir, { recursive: true, force: true });
  });

  /** A database at migration 8 with entries written as the app wrote them then (times from the app, free text). */
  function oldDatabase(file: string) {
    const db = databaseAtMigration(file, 8, "2024-05-01T08:00:00.000Z");
    const put = db.prepare("insert into audit (id, at, actor, action, test_id, detail) values (?, ?, ?, ?, ?, ?)");
    put.run(1, "2024-05-01T08:00:00.000Z", "system", "test-imported", 1, "Demo A (invented)");
    put.run(2, "2024-05-01T08:05:00.000Z", null, "account-created", null, "jdoe (Dr J Doe (invented), clinician)");
    // an id gap, a detail with quotes, commas and non-Latin letters
    put.run(7, "2024-05-02T09:00:00.000Z", "jdoe", "test-renamed", 1, '“Demo A” → "Тест, β"');
    db.close();
  }

  it("chains the entries already there, in id order from the genesis, the same way every time, and goes on chaining", () => {
    const a = path.join(dir, "a.sqlite");
    const b = path.join(dir, "b.sqlite");
    oldDatabase(a);
    oldDatabase(b);
    process.env.CPET_DB = a;
    expect(verifyAuditChain()).toEqual({ ok: true, rows: 3 });
    const migrated = rows();
    // by hand: entry 1 from the genesis, entry 2 from entry 1, entry 7 from entry 2
    let previous = AUDIT_GENESIS;
    for (const r of migrated) {
      previous = auditChainHash(previous, { ...r, testId: r.test_id });
      expect(r.hash).toBe(previous);
    }
    expect(migrated.map((r) => r.at)).toEqual([
      "2024-05-01T08:00:00.000Z",
      "2024-05-01T08:05:00.000Z",
      "2024-05-02T09:00:00.000Z",
    ]);
    audit("jdoe", "log-in", null, null);
    expect(rows().at(-1)!.id).toBe(8);
    expect(verifyAuditChain()).toEqual({ ok: true, rows: 4 });
    expect(missingAuditGuards()).toEqual([]);
    // the trail is append-only again after the migration's one pass
    expect(() => getDb().prepare("update audit set detail = 'x' where id = 1").run()).toThrow(/append-only/);
    closeDb();

    process.env.CPET_DB = b;
    expect(rows().map((r) => r.hash)).toEqual(migrated.map((r) => r.hash));
  });
});
