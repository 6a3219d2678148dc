import "server-only";
import fs from "node:fs";
import path from "node:path";
import Database from "better-sqlite3";
import { registerAuditHashFunction } from "./auditChain";
import { MIGRATIONS } from "./migrations";

let instance: Database.Database | null = null;

/** Path of the embedded database: `CPET_DB` or `data/cpet-desk.sqlite` under the working directory. */
export function databasePath(): string {
  return process.env.CPET_DB ?? path.join(process.cwd(), "data", "cpet-desk.sqlite");
}

/** Open (once per process) and migrate the embedded SQLite database. */
export function getDb(): Database.Database {
  if (instance) return instance;
  const file = databasePath();
  if (file !== ":memory:") fs.mkdirSync(path.dirname(file), { recursive: true });
  const db = new Database(file);
  db.pragma("journal_mode = WAL");
  db.pragma("foreign_keys = ON");
  migrate(db);
  instance = db;
  return db;
}

/**
 * Apply numbered migrations not yet applied (recorded in `schema_migrations`). Also gives the connection the audit
 * trail's hash function, which every audit insert uses (`cpet_audit_hash`, lib/store/auditChain.ts).
 */
export function migrate(db: Database.Database): void {
  registerAuditHashFunction(db);
  db.exec("create table if not exists schema_migrations (id integer primary key, name text not null, applied_at text not null)");
  const done = new Set(
    db
      .prepare("select id from schema_migrations")
      .all()
      .map((r) => (r as { id: number }).id),
  );
  for (const m of MIGRATIONS) {
    if (done.has(m.id)) continue;
    db.transaction(() => {
      db.exec(m.sql);
      m.run?.(db);
      db.prepare("insert into schema_migrations (id, name, applied_at) values (?, ?, ?)").run(
        m.id,
        m.name,
        new Date().toISOString(),
      );
    })();
  }
}

/** For tests: close and forget the shared instance. */
export function closeDb(): void {
  instance?.close();
  instance = null;
}
