/**
 * `cpet audit verify` run as a user runs it (node bin/cpet.mjs, a temporary database): 0 while the hash chain holds and
 * the guards are in place, 1 once an entry was changed with another tool (after dropping the triggers, as someone with
 * the file could), with the entry named; 2 for a database path that does not exist. Entries are INVENTED.
 */
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import Database from "better-sqlite3";
import { afterAll, describe, expect, it } from "vitest";
import { closeDb, getDb } from "../../lib/store/db";
import { audit } from "../../lib/store/tests";

const bin = path.join(__dirname, "..", "..", "bin", "cpet.mjs");
const dir = fs.mkdtempSync(path.join(os.tmpdir(), "cpet-audit-cli-"));
const dbFile = path.join(dir, "trail.sqlite");
const cpet = (args: string[]) => spawnSync(process.execPath, [bin, "audit", ...args], { encoding: "utf8", timeout: 60_000 });

afterAll(() => {
  closeDb();
  fs.rmSync(dir, { recursive: true, force: true });
});

describe("cpet audit verify", () => {
  it(
    "exits 0 on an intact trail, 1 with the entry named once one was changed, 2 without a database",
    { timeout: 120_000 },
    () => {
      process.env.CPET_DB = dbFile;
      closeDb();
      getDb();
      for (let i = 1; i <= 4; i++) audit("jdoe", "report-viewed", i, `report ${i} (version 1, draft)`);
      closeDb();

      const intact = cpet(["--db", dbFile, "verify"]);
      expect(intact.stderr).toBe("");
      expect(intact.status).toBe(0);
      expect(intact.stdout).toBe("audit trail: 4 entries, the hash chain holds\n");

      const raw = new Database(dbFile);
      raw.exec("drop trigger audit_no_update");
      raw.prepare("update audit set actor = 'asmith' where id = 2").run();
      raw.close();

      const broken = cpet(["--db", dbFile, "verify"]);
      expect(broken.status).toBe(1);
      expect(broken.stdout).toContain("audit trail: BROKEN at entry 2");
      expect(broken.stdout).toContain("guard(s) missing from the database: audit_no_update");
      expect(broken.stderr).toBe("cpet: the audit trail does not hold together at entry 2\n");
      const json = cpet(["--db", dbFile, "verify", "--json"]);
      expect(json.status).toBe(1);
      expect(JSON.parse(json.stdout)).toMatchObject({ ok: false, rows: 2, firstBrokenId: 2, missingGuards: ["audit_no_update"] });

      const missing = cpet(["--db", path.join(dir, "no-such.sqlite"), "verify"]);
      expect(missing.status).toBe(2);
      expect(missing.stderr).toContain("no database at");
      expect(fs.existsSync(path.join(dir, "no-such.sqlite"))).toBe(false);
    },
  );
});
