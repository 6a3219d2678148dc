/**
 * `cpet account` run as a user runs it (node bin/cpet.mjs, a temporary database): the password comes from stdin, a bad
 * role or short password is a usage error (exit 2), the first account says log-in is now required, and list --json
 * shows the accounts without any password hash. Account names and passwords are INVENTED.
 */
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import Database from "better-sqlite3";
import { afterAll, describe, expect, it } from "vitest";

const bin = path.join(__dirname, "..", "..", "bin", "cpet.mjs");
const dir = fs.mkdtempSync(path.join(os.tmpdir(), "cpet-account-cli-"));
const dbFile = path.join(dir, "accounts.sqlite");
const cpet = (args: string[], input = "") =>
  spawnSync(process.execPath, [bin, "account", "--db", dbFile, ...args], { encoding: "utf8", input, timeout: 60_000 });

afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

describe("cpet account", () => {
  // a dozen runs of the command, each starting node and tsx, several hashing a password (scrypt N = 2^17): 29 s on a busy
  // 2-core machine
  it("makes, lists, disables and enables accounts; refuses bad input with exit status 2", { timeout: 180_000 }, () => {
    // before the first account there is no database: only "add" may make one; "list" says so and leaves no file behind
    const none = cpet(["list"]);
    expect(none.status).toBe(2);
    expect(none.stderr).toContain(`no database at ${dbFile}`);
    expect(fs.existsSync(dbFile)).toBe(false);
    const bad = cpet(["add", "jdoe", "--name", "Dr J Doe (invented)", "--role", "nurse"], "correct horse battery\n");
    expect(bad.status).toBe(2);
    expect(bad.stderr).toContain("--role must be clinician or physiologist");
    const short = cpet(["add", "jdoe", "--name", "Dr J Doe (invented)", "--role", "clinician"], "short\n");
    expect(short.status).toBe(2);
    expect(short.stderr).toContain("at least 10 characters");

    const made = cpet(["add", "jdoe", "--name", "Dr J Doe (invented)", "--role", "clinician"], "correct horse battery\n");
    expect(made.status).toBe(0);
    expect(made.stdout).toContain('account "jdoe" made (Dr J Doe (invented), clinician)');
    expect(made.stdout).toContain("from now on the app asks everyone to sign in");

    // the audit trail names who ran the command on the database's machine
    const db = new Database(dbFile, { readonly: true });
    const createdBy = db.prepare("select actor from audit where action = 'account-created'").get() as { actor: string };
    db.close();
    expect(createdBy.actor).toMatch(/^cli(:.+)?$/);

    const list = cpet(["list", "--json"]);
    expect(list.status).toBe(0);
    const accounts = JSON.parse(list.stdout);
    expect(accounts).toEqual([expect.objectContaining({ username: "jdoe", role: "clinician", disabled: false })]);
    expect(list.stdout).not.toMatch(/scrypt|password/i);

    // the last enabled account is not disabled unless that is asked for: log-in would be off for everyone
    const refused = cpet(["disable", "jdoe"]);
    expect(refused.status).toBe(2);
    expect(refused.stderr).toContain("is the last enabled account");
    expect(cpet(["unlock", "jdoe"]).stdout).toContain('log-in for "jdoe" unlocked');
    const off = cpet(["disable", "jdoe", "--leave-app-open"]);
    expect(off.stdout).toContain("no longer asks anyone to sign in");
    expect(JSON.parse(cpet(["list", "--json"]).stdout)[0].disabled).toBe(true);
    expect(cpet(["enable", "jdoe"]).status).toBe(0);
    expect(cpet(["disable", "nobody"]).status).toBe(2);
    // every account change made with the command names who ran it, and the trail still holds together
    const trail = new Database(dbFile, { readonly: true });
    const changes = trail.prepare("select action, actor, detail from audit where action like 'account-%' order by id").all() as {
      action: string;
      actor: string | null;
      detail: string;
    }[];
    trail.close();
    expect(changes.map((c) => c.action)).toEqual(["account-created", "account-unlocked", "account-disabled", "account-enabled"]);
    for (const c of changes) expect(c.actor).toMatch(/^cli(:.+)?$/);
    const verify = spawnSync(process.execPath, [bin, "audit", "--db", dbFile, "verify"], { encoding: "utf8", timeout: 60_000 });
    expect(verify.status).toBe(0);
  });
});
