import "server-only";
import { createHash } from "node:crypto";
import type Database from "better-sqlite3";

/**
 * The audit trail's hash chain. Each entry stores `hash` = SHA-256 (FIPS 180-4, NIST 2015, recalled; node:crypto's
 * implementation), in hex, over the previous entry's hash and its own fields, so changing, inserting or removing an
 * entry in the middle of the trail changes every later hash: one pass over the table (`verifyAuditChain`) finds the
 * first entry that no longer fits. The first entry chains from `AUDIT_GENESIS`.
 *
 * What it does and does not prove: it detects an entry edited by someone who does not recompute the chain (another tool
 * on the database file, a raw SQL statement). Someone who knows this code can recompute every hash after an edit, and
 * removing the newest entries leaves a shorter chain that still verifies: it is tamper evidence, not tamper proof.
 */

/** Where the chain starts: the "previous hash" of the first entry (64 zeros, this product's choice). */
export const AUDIT_GENESIS = "0".repeat(64);

/** The fields of an entry that its hash covers, as stored. */
export interface AuditChainFields {
  id: number;
  at: string;
  actor: string | null;
  action: string;
  testId: number | null;
  detail: string | null;
}

/**
 * The hash of an entry: SHA-256 over the UTF-8 of the JSON array [previous hash, id, at, actor, action, test id, detail].
 * JSON keeps the fields apart unambiguously (a separator typed into a detail cannot shift one field into the next) and
 * tells null from the text "null".
 */
export function auditChainHash(previousHash: string, e: AuditChainFields): string {
  const canonical = JSON.stringify([previousHash, e.id, e.at, e.actor, e.action, e.testId, e.detail]);
  return createHash("sha256").update(canonical, "utf8").digest("hex");
}

/** Name of the SQL function the database connection gets, so an entry is hashed by the statement that writes it. */
export const AUDIT_HASH_SQL_FUNCTION = "cpet_audit_hash";

/** Give a connection `cpet_audit_hash(previous, id, at, actor, action, test_id, detail)`. */
export function registerAuditHashFunction(db: Database.Database): void {
  db.function(AUDIT_HASH_SQL_FUNCTION, { deterministic: true }, (previous, id, at, actor, action, testId, detail) =>
    auditChainHash(String(previous), {
      id: Number(id),
      at: String(at),
      actor: actor === null ? null : String(actor),
      action: String(action),
      testId: testId === null ? null : Number(testId),
      detail: detail === null ? null : String(detail),
    }),
  );
}

/**
 * Hash every entry of an existing trail in id order, from the genesis (migration 9 on a database made before the chain).
 * Deterministic: the same entries always give the same hashes. The caller has lifted the no-update trigger.
 */
export function chainExistingAuditEntries(db: Database.Database): number {
  const rows = db
    .prepare("select id, at, actor, action, test_id as testId, detail from audit order by id")
    .all() as AuditChainFields[];
  const set = db.prepare("update audit set hash = ? where id = ?");
  let previous = AUDIT_GENESIS;
  for (const row of rows) {
    previous = auditChainHash(previous, row);
    set.run(previous, row.id);
  }
  return rows.length;
}
