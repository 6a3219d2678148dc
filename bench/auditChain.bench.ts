/**
 * The audit trail's hash chain on 100 000 entries (INVENTED entries, in a temporary database file): time per entry to
 * write one the app's way, to chain an old database's entries (migration 9), to check the whole chain
 * (`verifyAuditChain`, what `cpet audit verify` and the first page after start-up do), and the later, incremental check
 * of the masthead (`auditTrailStatus`). Run: `npx tsx bench/auditChain.bench.ts`. Prints a markdown table; asserts nothing.
 */
import fs from "node:fs";
import Module from "node:module";
import os from "node:os";
import path from "node:path";

// lib/store marks itself "server-only" for the web bundler; here that marker resolves to the CLI's empty stand-in
const stub = path.join(path.dirname(new URL(import.meta.url).pathname), "..", "bin", "server-only-stub.cjs");
const mod = Module as unknown as { _resolveFilename: (request: string, ...rest: unknown[]) => string };
const resolveFilename = mod._resolveFilename;
mod._resolveFilename = (request: string, ...rest: unknown[]) =>
  request === "server-only" ? stub : resolveFilename(request, ...rest);

const N = 100_000;

async function main() {
  const { closeDb, getDb } = await import("../lib/store/db");
  const { audit } = await import("../lib/store/tests");
  const { auditTrailStatus, verifyAuditChain } = await import("../lib/store/auditTrail");
  const { databaseAtMigration } = await import("../tests/fixtures/databaseAtMigration");
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "cpet-audit-bench-"));
  const rows: [string, number, string][] = [];
  const time = (label: string, n: number, f: () => unknown) => {
    const t0 = process.hrtime.bigint();
    const out = f();
    const ms = Number(process.hrtime.bigint() - t0) / 1e6;
    rows.push([label, n, `${ms.toFixed(0)} ms total, ${((ms * 1000) / n).toFixed(2)} µs per entry`]);
    return out;
  };
  try {
    // entries as the app writes them, one statement each (each its own transaction, as in the app)
    process.env.CPET_DB = path.join(dir, "new.sqlite");
    closeDb();
    getDb();
    time("write an entry (`audit`, own transaction)", 10_000, () => {
      for (let i = 0; i < 10_000; i++) audit("jdoe", "report-viewed", i % 500, `report ${i} (version 1, draft)`);
    });
    getDb().transaction(() => {
      for (let i = 10_000; i < N; i++) audit("jdoe", "report-viewed", i % 500, `report ${i} (version 1, draft)`);
    })();
    closeDb();
    getDb();
    const full = time("check the whole chain (`verifyAuditChain`)", N, () => verifyAuditChain());
    if (!(full as { ok: boolean }).ok) throw new Error("the bench chain does not verify");
    time("first masthead check after opening (`auditTrailStatus`, whole chain)", N, () => auditTrailStatus());
    audit("jdoe", "log-out", null, null);
    time("later masthead check, one new entry (`auditTrailStatus`)", 1, () => auditTrailStatus());
    closeDb();

    // a database made before the chain, with N entries, brought up to date
    const old = path.join(dir, "old.sqlite");
    const db = databaseAtMigration(old, 8, "2024-01-01T00:00:00.000Z");
    const put = db.prepare("insert into audit (at, actor, action, test_id, detail) values (?, ?, ?, ?, ?)");
    db.transaction(() => {
      for (let i = 0; i < N; i++)
        put.run(new Date(1.7e12 + i * 1000).toISOString(), "jdoe", "report-draft-saved", i % 500, `report ${i}`);
    })();
    db.close();
    process.env.CPET_DB = old;
    time("chain an old database's entries (migration 9, on opening)", N, () => getDb());
    closeDb();
  } finally {
    closeDb();
    fs.rmSync(dir, { recursive: true, force: true });
  }
  console.log(`Machine: ${os.cpus()[0]?.model ?? "unknown CPU"}, ${os.cpus().length} cores, Node ${process.version}\n`);
  console.log("| step | entries | time |\n| --- | ---: | --- |");
  for (const [label, n, t] of rows) console.log(`| ${label} | ${n} | ${t} |`);
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
