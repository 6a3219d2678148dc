import fs from "node:fs";
import os from "node:os";
import { createInterface } from "node:readline";
import { Writable } from "node:stream";
import type { Command } from "commander";
import * as accounts from "../lib/store/accounts";
import { databasePath } from "../lib/store/db";
import { EXIT_STATUS_HELP, UsageError } from "./usageError";

/**
 * `cpet account`: the log-in accounts of this installation, made on the machine that holds the database (never from the
 * web page). With no enabled account the app needs no log-in; the first account makes log-in required.
 *   cpet account add jdoe --name "Dr J Doe" --role clinician     (asks the password twice, or reads one line from stdin)
 *   cpet account list [--json]
 *   cpet account disable jdoe [--leave-app-open] | enable jdoe | unlock jdoe | password jdoe
 * `--db FILE` (or CPET_DB) names the database; the default is the app's, data/cpet-desk.sqlite under the current folder.
 */
export function registerAccount(program: Command): void {
  const account = program
    .command("account")
    .description("Log-in accounts of this installation (the first account makes log-in required)")
    .option("--db <file>", "the database file (default: CPET_DB or data/cpet-desk.sqlite)")
    .addHelpText("after", EXIT_STATUS_HELP);

  account
    .command("add <username>")
    .description("make an account; the password is asked twice (or read as one line from stdin when it is not a terminal)")
    .requiredOption("--name <display name>", 'the name a signature shows, e.g. "Dr J Doe"')
    .requiredOption("--role <role>", "clinician (may sign reports) | physiologist (everything but signing)")
    .action(async (username: string, opts: { name: string; role: string }) => {
      const store = useDatabase(account, true);
      if (opts.role !== "clinician" && opts.role !== "physiologist")
        throw new UsageError(`--role must be clinician or physiologist, not "${opts.role}"`);
      const wasOpen = !store.accountsEnabled();
      const password = await readNewPassword();
      const res = store.createAccount({ username, displayName: opts.name, role: opts.role, password }, cliActor());
      if (!res.ok) throw new UsageError(res.reason);
      process.stdout.write(`account "${res.account.username}" made (${res.account.displayName}, ${res.account.role})\n`);
      if (wasOpen) process.stdout.write("This is the first account: from now on the app asks everyone to sign in.\n");
    });

  account
    .command("list")
    .description("list the accounts")
    .option("--json", "print one JSON array on stdout")
    .action(async (opts: { json?: boolean }) => {
      const store = useDatabase(account);
      const all = store.listAccounts();
      if (opts.json) {
        process.stdout.write(JSON.stringify(all, null, 2) + "\n");
        return;
      }
      if (all.length === 0) process.stdout.write("no accounts: the app needs no log-in\n");
      for (const a of all)
        process.stdout.write(
          `${a.username}\t${a.displayName}\t${a.role}${a.disabled ? "\tdisabled" : ""}\tmade ${a.createdAt}\n`,
        );
    });

  account
    .command("disable <username>")
    .description("disable an account and end its sessions")
    .option("--leave-app-open", "allow disabling the last enabled account, which turns log-in off for everyone")
    .action(async (username: string, opts: { leaveAppOpen?: boolean }) => {
      const store = useDatabase(account);
      const target = store.getAccount(username);
      if (!target) throw new UsageError(`no account "${username}"`);
      const othersEnabled = store.listAccounts().some((a) => !a.disabled && a.username !== target.username);
      // failing open must be asked for: without log-in anyone who reaches the app can sign with a typed name
      if (!target.disabled && !othersEnabled && !opts.leaveAppOpen)
        throw new UsageError(
          `"${target.username}" is the last enabled account: disabling it turns log-in off, and anyone who reaches the app could then sign with a typed name. Make another account first, or repeat with --leave-app-open.`,
        );
      store.setAccountDisabled(username, true, cliActor());
      process.stdout.write(`account "${target.username}" disabled\n`);
      if (!store.accountsEnabled())
        process.stdout.write("No enabled account is left: the app no longer asks anyone to sign in.\n");
    });

  account
    .command("enable <username>")
    .description("enable a disabled account")
    .action(async (username: string) => {
      const store = useDatabase(account);
      if (!store.setAccountDisabled(username, false, cliActor())) throw new UsageError(`no account "${username}"`);
      process.stdout.write(`account "${username}" enabled\n`);
    });

  account
    .command("unlock <username>")
    .description("lift a lock-out after repeated failed log-ins")
    .action(async (username: string) => {
      const store = useDatabase(account);
      if (!store.unlockAccount(username, cliActor())) throw new UsageError(`no account "${username}"`);
      process.stdout.write(`log-in for "${username}" unlocked\n`);
    });

  account
    .command("password <username>")
    .description("set a new password (ends the account's sessions)")
    .action(async (username: string) => {
      const store = useDatabase(account);
      if (!store.getAccount(username)) throw new UsageError(`no account "${username}"`);
      const res = store.setAccountPassword(username, await readNewPassword(), cliActor());
      if (!res.ok) throw new UsageError(res.reason);
      process.stdout.write(`password of "${username}" set\n`);
    });
}

/**
 * The accounts store, on `--db` when given (the database opens on first use, so other commands never open it). Only
 * `add` may make a new database (the first account of a new installation); every other command refuses a path with no
 * database, where opening it would leave an empty file behind and answer as if the installation had no accounts.
 */
function useDatabase(account: Command, mayCreate = false): typeof accounts {
  const db = account.opts<{ db?: string }>().db;
  if (db) process.env.CPET_DB = db;
  const file = databasePath();
  if (!mayCreate && file !== ":memory:" && !fs.existsSync(file)) throw new UsageError(`no database at ${file}`);
  return accounts;
}

/** The new password: typed twice without echo on a terminal, else the first line of stdin. */
async function readNewPassword(): Promise<string> {
  if (!process.stdin.isTTY) {
    const rl = createInterface({ input: process.stdin });
    for await (const line of rl) {
      rl.close();
      return line;
    }
    throw new UsageError("no password on stdin");
  }
  const first = await askHidden("New password: ");
  const second = await askHidden("The same password again: ");
  if (first !== second) throw new UsageError("the two passwords differ");
  return first;
}

function askHidden(question: string): Promise<string> {
  let muted = false;
  const output = new Writable({
    write(chunk, _enc, done) {
      if (!muted) process.stderr.write(chunk);
      done();
    },
  });
  const rl = createInterface({ input: process.stdin, output, terminal: true });
  return new Promise((resolve) => {
    rl.question(question, (answer) => {
      rl.close();
      process.stderr.write("\n");
      resolve(answer);
    });
    muted = true;
  });
}

/** Who ran the command, for the audit trail: the operating-system user on the database's machine. */
function cliActor(): string {
  try {
    return `cli:${os.userInfo().username}`;
  } catch {
    return "cli";
  }
}
