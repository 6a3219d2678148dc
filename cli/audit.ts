import fs from "node:fs";
import type { Command } from "commander";
import { databasePath } from "../lib/store/db";
import * as trail from "../lib/store/auditTrail";
import { UsageError } from "./usageError";

/** The audit trail was checked and does not hold together: exit status 1, with the finding on stderr. */
export class AuditTrailBroken extends Error {
  override name = "AuditTrailBroken";
}

/**
 * `cpet audit verify`: check the whole audit trail of a database against its hash chain, and that the triggers guarding
 * it are in place. Prints what it found (`--json`: one object) and exits 0 when the chain holds and every guard is
 * there, 1 otherwise. `--db FILE` (or CPET_DB) names the database. Opening an older database brings it up to date first
 * (its entries are chained then), as the app does.
 */
export function registerAudit(program: Command): void {
  const audit = program
    .command("audit")
    .description("The audit trail of this installation")
    .option("--db <file>", "the database file (default: CPET_DB or data/cpet-desk.sqlite)");

  audit
    .command("verify")
    .description("check every audit entry against the hash chain and that the trail's guards are in place")
    .option("--json", "print one JSON object on stdout")
    .addHelpText(
      "after",
      `
Exit status: 0 the chain holds and every guard is in place; 1 an entry does not fit the chain, a guard is missing or
the database cannot be read; 2 the command itself is wrong (e.g. no database at the path given).`,
    )
    .action((opts: { json?: boolean }) => {
      const db = audit.opts<{ db?: string }>().db;
      if (db) process.env.CPET_DB = db;
      const file = databasePath();
      // opening a missing file would make an empty database whose empty trail "verifies"
      if (!fs.existsSync(file)) throw new UsageError(`no database at ${file}`);
      const check = trail.verifyAuditChain();
      const missingGuards = trail.missingAuditGuards();
      if (opts.json) process.stdout.write(JSON.stringify({ ...check, missingGuards }, null, 2) + "\n");
      else {
        process.stdout.write(
          check.ok
            ? `audit trail: ${check.rows} entries, the hash chain holds\n`
            : `audit trail: BROKEN at entry ${check.firstBrokenId} (${check.rows} entries read): ${check.reason}\n`,
        );
        if (missingGuards.length > 0)
          process.stdout.write(`audit trail: guard(s) missing from the database: ${missingGuards.join(", ")}\n`);
      }
      if (!check.ok) throw new AuditTrailBroken(`the audit trail does not hold together at entry ${check.firstBrokenId}`);
      if (missingGuards.length > 0)
        throw new AuditTrailBroken(
          `the audit trail's guards were removed (${missingGuards.join(", ")}): the database no longer refuses changes to it`,
        );
    });
}
