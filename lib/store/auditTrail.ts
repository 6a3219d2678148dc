import "server-only";
import type Database from "better-sqlite3";
import { AUDIT_GENESIS, AUDIT_HASH_SQL_FUNCTION, auditChainHash, type AuditChainFields } from "./auditChain";
import { getDb } from "./db";

/**
 * Writing and checking the audit trail (table `audit`, append-only by migration 7, time from the database clock and
 * hash-chained by migration 9). See lib/store/README.md, "The audit trail".
 */

/** An entry's time as the database writes it: ISO 8601 in UTC with milliseconds, as `Date.toISOString()` gives. */
const DB_NOW = "strftime('%Y-%m-%dT%H:%M:%fZ', 'now')";

/**
 * One statement reads the database clock, the newest entry's id and hash, and writes the new entry with its chain hash,
 * so no other writer can slip in between (SQLite takes the write lock when the statement starts). `@onlyIfNoneSince` is
 * null for an ordinary entry; a number of minutes makes the insert a no-op when the same actor already has an entry of
 * this action on this test that recent (`auditAtMostEvery`).
 */
const INSERT_SQL = `
  insert into audit (id, at, actor, action, test_id, detail, hash)
  select n.id, n.at, @actor, @action, @testId, @detail,
         ${AUDIT_HASH_SQL_FUNCTION}(n.prev, n.id, n.at, @actor, @action, @testId, @detail)
  from (select coalesce((select max(id) from audit), 0) + 1 as id,
               ${DB_NOW} as at,
               coalesce((select hash from audit order by id desc limit 1), @genesis) as prev) n
  where @onlyIfNoneSince is null
     or not exists (select 1 from audit a
                    where a.test_id is @testId and a.action = @action and a.actor is @actor
                      and a.at > strftime('%Y-%m-%dT%H:%M:%fZ', 'now', '-' || @onlyIfNoneSince || ' minutes'))`;

function insert(
  actor: string | null,
  action: string,
  testId: number | null,
  detail: string | null,
  onlyIfNoneSince: number | null,
): boolean {
  const info = getDb().prepare(INSERT_SQL).run({ actor, action, testId, detail, onlyIfNoneSince, genesis: AUDIT_GENESIS });
  return info.changes === 1;
}

/** Add an entry to the audit trail; its time is the database's clock. */
export function audit(actor: string | null, action: string, testId: number | null, detail: string | null): void {
  insert(actor, action, testId, detail, null);
}

/**
 * Add an entry unless the same actor already has one of this action on this test within the last `minutes` (for what
 * is done again and again, such as opening a report page). Returns whether an entry was written.
 */
export function auditAtMostEvery(
  minutes: number,
  actor: string | null,
  action: string,
  testId: number | null,
  detail: string | null,
): boolean {
  if (!(minutes > 0)) throw new Error("auditAtMostEvery needs a positive number of minutes");
  return insert(actor, action, testId, detail, minutes);
}

/** The result of checking the chain: data, never a throw. */
export interface AuditChainCheck {
  /** Every entry's hash fits its fields and the entry before it. */
  ok: boolean;
  /** Entries checked. */
  rows: number;
  /** The first entry whose hash does not fit (the edited entry, or the one after a removed or inserted one). */
  firstBrokenId?: number;
  /** Why, in words. */
  reason?: string;
}

interface AuditRow extends AuditChainFields {
  hash: string | null;
}

/** How far a check got: the last entry that fitted, its hash and the hash before it (genesis and 0 when none). */
interface ChainPosition {
  lastId: number;
  lastHash: string;
  hashBefore: string;
}

const SELECT_ROWS = "select id, at, actor, action, test_id as testId, detail, hash from audit";

/** Check entries after `from.lastId` (whose hash is `from.lastHash`), in id order. */
function checkFrom(db: Database.Database, from: ChainPosition): AuditChainCheck & ChainPosition {
  const rows = db.prepare(`${SELECT_ROWS} where id > ? order by id`).iterate(from.lastId) as IterableIterator<AuditRow>;
  let n = 0;
  let at: ChainPosition = { lastId: from.lastId, lastHash: from.lastHash, hashBefore: from.hashBefore };
  for (const row of rows) {
    n += 1;
    const broken = (reason: string) => ({ ok: false, rows: n, firstBrokenId: row.id, reason, ...at });
    if (row.hash === null) return broken(`entry ${row.id} has no chain hash: it was written without the app`);
    if (auditChainHash(at.lastHash, row) !== row.hash)
      return broken(
        `entry ${row.id} does not fit the chain: it was changed, written without the app, or an entry before it was removed`,
      );
    at = { lastId: row.id, lastHash: row.hash, hashBefore: at.lastHash };
  }
  return { ok: true, rows: n, ...at };
}

const START: ChainPosition = { lastId: 0, lastHash: AUDIT_GENESIS, hashBefore: AUDIT_GENESIS };

/**
 * Check the whole audit trail against its hash chain, from the genesis value. Returns `{ ok, rows, firstBrokenId?,
 * reason? }`; a broken chain is reported, never thrown. Costs one pass over the table (see lib/store/README.md for the
 * measured time per entry).
 */
export function verifyAuditChain(db: Database.Database = getDb()): AuditChainCheck {
  const { ok, rows, firstBrokenId, reason } = checkFrom(db, START);
  return ok ? { ok, rows } : { ok, rows, firstBrokenId, reason };
}

/** The triggers that keep the trail append-only and its times and hashes honest (migrations 7 and 9). */
export const AUDIT_GUARDS = ["audit_no_update", "audit_no_delete", "audit_time_and_hash"] as const;

/** Guards missing from the database (someone with the file dropped them). */
export function missingAuditGuards(db: Database.Database = getDb()): string[] {
  const present = new Set(
    (db.prepare("select name from sqlite_master where type = 'trigger' and tbl_name = 'audit'").all() as { name: string }[]).map(
      (r) => r.name,
    ),
  );
  return AUDIT_GUARDS.filter((g) => !present.has(g));
}

export interface AuditTrailStatus extends AuditChainCheck {
  missingGuards: string[];
}

/** Per open database: how far the chain has been checked, or the break found (kept: a break does not heal). */
const checked = new WeakMap<Database.Database, (ChainPosition & { rows: number }) | AuditChainCheck>();

/**
 * The audit trail's standing for a warning on screen, kept cheap for every page: the first call after the database is
 * opened checks the whole chain; later calls check that the newest entry checked before still fits (its fields and
 * hash, from the hash before it) and then only the entries written since. An older entry changed while the app runs is
 * found at the next start or by `cpet audit verify`, which checks everything. A break, once found, is reported until
 * the database is opened again.
 */
export function auditTrailStatus(db: Database.Database = getDb()): AuditTrailStatus {
  const missingGuards = missingAuditGuards(db);
  const seen = checked.get(db);
  if (seen && "ok" in seen) return { ...seen, missingGuards };
  const brokenAt = (check: AuditChainCheck): AuditTrailStatus => {
    checked.set(db, check);
    return { ...check, missingGuards };
  };
  if (seen && seen.lastId > 0) {
    const last = db.prepare(`${SELECT_ROWS} where id = ?`).get(seen.lastId) as AuditRow | undefined;
    if (!last || last.hash !== seen.lastHash || auditChainHash(seen.hashBefore, last) !== seen.lastHash)
      return brokenAt({
        ok: false,
        rows: seen.rows,
        firstBrokenId: seen.lastId,
        reason: `entry ${seen.lastId} was changed or removed after it was checked`,
      });
  }
  const r = checkFrom(db, seen ?? START);
  const rows = (seen?.rows ?? 0) + r.rows;
  if (!r.ok) return brokenAt({ ok: false, rows, firstBrokenId: r.firstBrokenId, reason: r.reason });
  checked.set(db, { lastId: r.lastId, lastHash: r.lastHash, hashBefore: r.hashBefore, rows });
  return { ok: true, rows, missingGuards };
}
