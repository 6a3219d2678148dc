import "server-only";
import { createHash, randomBytes, scrypt, scryptSync, timingSafeEqual } from "node:crypto";
import { unprintableInPdf } from "../report/pdf/pdfText";
import { getDb } from "./db";
import { audit } from "./tests";

/**
 * Optional local accounts. With no enabled account the app is open to whoever reaches it (one workstation, listening on
 * 127.0.0.1: the default); once one exists, every page, download and form asks for a session, and a signature carries
 * the signed-in account instead of a typed name. Accounts are made and disabled with the CLI (`cpet account …`), on the
 * machine that holds the database, so nobody can make themselves an account through the web page.
 */

/** Who may do what: a clinician may sign reports; a physiologist may do everything else (import, review, draft). */
export type AccountRole = "clinician" | "physiologist";
export const ACCOUNT_ROLES: readonly AccountRole[] = ["clinician", "physiologist"];

export interface Account {
  id: number;
  username: string;
  displayName: string;
  role: AccountRole;
  disabled: boolean;
  createdAt: string;
}

interface AccountRow {
  id: number;
  username: string;
  display_name: string;
  role: AccountRole;
  password_hash: string;
  disabled: number;
  created_at: string;
}

/** Shortest password accepted. NIST SP 800-63B (2017) asks at least 8 characters (recalled); 10 is this product's choice. */
export const PASSWORD_MIN_CHARS = 10;
/** Longest password accepted (keeps a hash request bounded). */
export const PASSWORD_MAX_CHARS = 200;
/** How long a session lasts from log-in at most: one working shift (common practice). */
export const SESSION_HOURS = 12;
/**
 * A session unused this long ends: NIST SP 800-63B (2017) asks re-authentication after 30 minutes of inactivity at its
 * second assurance level (recalled).
 */
export const SESSION_IDLE_MINUTES = 30;
/** Failed log-ins for one user name within `LOCKOUT_MINUTES` after which log-in is refused for that long (common practice). */
export const LOCKOUT_FAILURES = 5;
export const LOCKOUT_MINUTES = 15;

/**
 * scrypt cost. OWASP Password Storage Cheat Sheet (2023) recommends N = 2^17, r = 8, p = 1 (recalled). The parameters are
 * kept in each hash, so they can be raised later without breaking stored passwords.
 */
const SCRYPT = { N: 2 ** 17, r: 8, p: 1, keyLen: 64 };
const scryptMaxmem = (N: number, r: number) => 128 * N * r * 2;

const USERNAME = /^[a-z0-9][a-z0-9._-]{1,39}$/;

/** `scrypt$N$r$p$salt$hash` (salt and hash base64). */
export function hashPassword(password: string): string {
  const salt = randomBytes(16);
  const key = scryptSync(password.normalize("NFC"), salt, SCRYPT.keyLen, {
    N: SCRYPT.N,
    r: SCRYPT.r,
    p: SCRYPT.p,
    maxmem: scryptMaxmem(SCRYPT.N, SCRYPT.r),
  });
  return ["scrypt", SCRYPT.N, SCRYPT.r, SCRYPT.p, salt.toString("base64"), key.toString("base64")].join("$");
}

/**
 * Whether `password` matches a hash made by `hashPassword` (constant-time comparison of the derived keys). Runs off the
 * server's main thread (libuv's pool): a check costs about 0.35 s of hashing, which must not stall other requests.
 */
export function verifyPassword(password: string, stored: string): Promise<boolean> {
  const [kind, n, r, p, salt, hash] = stored.split("$");
  if (kind !== "scrypt" || !salt || !hash) return Promise.resolve(false);
  const expected = Buffer.from(hash, "base64");
  return new Promise((resolve, reject) =>
    scrypt(
      password.normalize("NFC"),
      Buffer.from(salt, "base64"),
      expected.length,
      { N: Number(n), r: Number(r), p: Number(p), maxmem: scryptMaxmem(Number(n), Number(r)) },
      (err, key) => (err ? reject(err) : resolve(key.length === expected.length && timingSafeEqual(key, expected))),
    ),
  );
}

/**
 * A stored hash to check against when the user name is unknown, so a wrong name takes as long as a wrong password: the
 * cost is the key derivation, which does not depend on the stored key, so random bytes serve (nothing is hashed here).
 */
const DECOY_HASH = [
  "scrypt",
  SCRYPT.N,
  SCRYPT.r,
  SCRYPT.p,
  randomBytes(16).toString("base64"),
  randomBytes(SCRYPT.keyLen).toString("base64"),
].join("$");

const now = () => new Date().toISOString();
const sha256 = (s: string) => createHash("sha256").update(s).digest("hex");

function toAccount(row: AccountRow): Account {
  return {
    id: row.id,
    username: row.username,
    displayName: row.display_name,
    role: row.role,
    disabled: row.disabled === 1,
    createdAt: row.created_at,
  };
}

/** Problems with a new password, in words (empty when it is acceptable). */
export function passwordProblems(password: string, username: string): string[] {
  const out: string[] = [];
  if ([...password].length < PASSWORD_MIN_CHARS) out.push(`the password must have at least ${PASSWORD_MIN_CHARS} characters`);
  if ([...password].length > PASSWORD_MAX_CHARS) out.push(`the password must have at most ${PASSWORD_MAX_CHARS} characters`);
  if (password.toLowerCase().includes(username.toLowerCase())) out.push("the password must not contain the user name");
  return out;
}

export type AccountResult = { ok: true; account: Account } | { ok: false; reason: string };

/** Make an account (audit: `account-created`). The display name is what a signature shows, so it must print in the PDF. */
export function createAccount(
  input: { username: string; displayName: string; role: AccountRole; password: string },
  /** Who made it, for the audit trail (the CLI passes `cli:<operating-system user>`). */
  actor: string,
): AccountResult {
  const username = input.username.trim().toLowerCase();
  const displayName = input.displayName.trim().normalize("NFC");
  if (!USERNAME.test(username))
    return {
      ok: false,
      reason: "user name: 2-40 characters, lower-case letters, digits, dot, dash or underscore, starting with a letter or digit",
    };
  if (displayName.length === 0 || displayName.length > 100) return { ok: false, reason: "display name: 1-100 characters" };
  const bad = unprintableInPdf(displayName);
  if (bad.length > 0) return { ok: false, reason: `display name: the report PDF cannot print ${bad.join(", ")}` };
  if (!ACCOUNT_ROLES.includes(input.role)) return { ok: false, reason: `role: one of ${ACCOUNT_ROLES.join(", ")}` };
  const problems = passwordProblems(input.password, username);
  if (problems.length > 0) return { ok: false, reason: problems.join("; ") };
  const db = getDb();
  if (db.prepare("select 1 from accounts where username = ?").get(username))
    return { ok: false, reason: `user name "${username}" is taken` };
  db.prepare("insert into accounts (username, display_name, role, password_hash, created_at) values (?, ?, ?, ?, ?)").run(
    username,
    displayName,
    input.role,
    hashPassword(input.password),
    now(),
  );
  audit(actor, "account-created", null, `${username} (${displayName}, ${input.role})`);
  return { ok: true, account: getAccount(username)! };
}

export function getAccount(username: string): Account | null {
  const row = getDb().prepare("select * from accounts where username = ?").get(username.trim().toLowerCase()) as
    AccountRow | undefined;
  return row ? toAccount(row) : null;
}

export function listAccounts(): Account[] {
  return (getDb().prepare("select * from accounts order by username").all() as AccountRow[]).map(toAccount);
}

/** Whether log-in is required: at least one account that is not disabled. */
export function accountsEnabled(): boolean {
  return getDb().prepare("select 1 from accounts where disabled = 0 limit 1").get() !== undefined;
}

/** Disable (or enable again) an account; disabling ends its sessions (audit: `account-disabled` / `account-enabled`). */
export function setAccountDisabled(username: string, disabled: boolean, actor: string): boolean {
  const db = getDb();
  return db.transaction(() => {
    const account = getAccount(username);
    if (!account) return false;
    db.prepare("update accounts set disabled = ? where id = ?").run(disabled ? 1 : 0, account.id);
    if (disabled) db.prepare("delete from sessions where account_id = ?").run(account.id);
    audit(actor, disabled ? "account-disabled" : "account-enabled", null, account.username);
    return true;
  })();
}

/** Set a new password; ends the account's sessions (audit: `account-password-set`). */
export function setAccountPassword(username: string, password: string, actor: string): AccountResult {
  const account = getAccount(username);
  if (!account) return { ok: false, reason: `no account "${username}"` };
  const problems = passwordProblems(password, account.username);
  if (problems.length > 0) return { ok: false, reason: problems.join("; ") };
  const db = getDb();
  db.transaction(() => {
    db.prepare("update accounts set password_hash = ? where id = ?").run(hashPassword(password), account.id);
    db.prepare("delete from sessions where account_id = ?").run(account.id);
    audit(actor, "account-password-set", null, account.username);
  })();
  return { ok: true, account };
}

/**
 * Whether log-in for a user name is locked: `LOCKOUT_FAILURES` failed attempts within the `LOCKOUT_MINUTES` before `at`,
 * counted since the name was last unlocked (`unlockAccount`). Attempts refused while locked are not failures.
 */
export function lockedOut(username: string, at: Date = new Date()): boolean {
  const db = getDb();
  const since = new Date(at.getTime() - LOCKOUT_MINUTES * 60_000).toISOString();
  const unlocked = (
    db.prepare("select max(at) as at from audit where action = 'account-unlocked' and detail = ?").get(username) as {
      at: string | null;
    }
  ).at;
  const from = unlocked && unlocked > since ? unlocked : since;
  const n = (
    db.prepare("select count(*) as n from audit where action = 'log-in-failed' and actor = ? and at > ?").get(username, from) as {
      n: number;
    }
  ).n;
  return n >= LOCKOUT_FAILURES;
}

/** Lift a lock-out now (audit: `account-unlocked`); failures before this no longer count. */
export function unlockAccount(username: string, actor: string): boolean {
  const account = getAccount(username);
  if (!account) return false;
  audit(actor, "account-unlocked", null, account.username);
  return true;
}

export type LogInResult = { ok: true; token: string; account: Account; expiresAt: string } | { ok: false; reason: string };

/** The same words for an unknown name, a wrong password and a disabled account, so the page does not tell which. */
export const LOG_IN_REFUSED = "The user name or password is not right, or the account is disabled.";

/**
 * Check a user name and password and open a session (audit: `log-in` / `log-in-failed`). After `LOCKOUT_FAILURES`
 * failed attempts for one user name within `LOCKOUT_MINUTES`, log-in for that name is refused until the window passes.
 * `replacesToken`, the session cookie the browser already held, is ended when the log-in succeeds (audit: `log-out`,
 * "ended by a new log-in from the same browser"), so a browser never holds two live sessions; a failed log-in leaves it.
 */
export async function logIn(
  usernameSent: string,
  password: string,
  at: Date = new Date(),
  replacesToken: string | null = null,
): Promise<LogInResult> {
  const username = usernameSent.trim().toLowerCase().slice(0, 40);
  const db = getDb();
  if (lockedOut(username, at)) {
    // not counted as a failure, so attempts while locked do not keep the lock going
    audit(username, "log-in-locked", null, "refused: too many failed attempts");
    return {
      ok: false,
      reason: `Too many failed attempts for this user name: try again in ${LOCKOUT_MINUTES} minutes, or ask whoever keeps the accounts to unlock it.`,
    };
  }
  const row = db.prepare("select * from accounts where username = ?").get(username) as AccountRow | undefined;
  const matches = await verifyPassword(password.slice(0, PASSWORD_MAX_CHARS), row?.password_hash ?? DECOY_HASH);
  if (!row || !matches || row.disabled === 1) {
    audit(
      username,
      "log-in-failed",
      null,
      !row ? "unknown user name" : row.disabled === 1 ? "account disabled" : "wrong password",
    );
    return { ok: false, reason: LOG_IN_REFUSED };
  }
  const token = randomBytes(32).toString("base64url");
  const expiresAt = new Date(at.getTime() + SESSION_HOURS * 3_600_000).toISOString();
  db.transaction(() => {
    if (replacesToken) endSession(replacesToken, "ended by a new log-in from the same browser");
    db.prepare(
      "insert into sessions (token_sha256, account_id, created_at, expires_at, last_seen_at) values (?, ?, ?, ?, ?)",
    ).run(sha256(token), row.id, at.toISOString(), expiresAt, at.toISOString());
    audit(username, "log-in", null, null);
  })();
  return { ok: true, token, account: toAccount(row), expiresAt };
}

/**
 * The account a session token belongs to, when the session has not expired, has been used within
 * `SESSION_IDLE_MINUTES`, and the account is enabled; each use keeps it alive.
 */
export function sessionAccount(token: string | undefined | null, at: Date = new Date()): Account | null {
  if (!token) return null;
  const db = getDb();
  const idleSince = new Date(at.getTime() - SESSION_IDLE_MINUTES * 60_000).toISOString();
  const row = db
    .prepare(
      "select a.* from sessions s join accounts a on a.id = s.account_id where s.token_sha256 = ? and s.expires_at > ? and coalesce(s.last_seen_at, s.created_at) > ? and a.disabled = 0",
    )
    .get(sha256(token), at.toISOString(), idleSince) as AccountRow | undefined;
  if (!row) return null;
  db.prepare("update sessions set last_seen_at = ? where token_sha256 = ?").run(at.toISOString(), sha256(token));
  return toAccount(row);
}

/**
 * Re-check a signed-in user's password (a signature asks for it again). A wrong password counts as a failed log-in
 * (lock-out included), so the sign form cannot be used to guess it.
 */
export async function confirmPassword(username: string, password: string): Promise<boolean> {
  const row = getDb().prepare("select * from accounts where username = ?").get(username) as AccountRow | undefined;
  if (!row || row.disabled === 1 || lockedOut(row.username)) return false;
  const ok = await verifyPassword(password.slice(0, PASSWORD_MAX_CHARS), row.password_hash);
  if (!ok) audit(row.username, "log-in-failed", null, "wrong password at signing");
  return ok;
}

/** End a session (audit: `log-out`); expired sessions are cleared at the same time. */
export function logOut(token: string | undefined | null): void {
  if (!token) return;
  endSession(token, null);
}

/** Delete a session and the expired ones; a session still live when ended is audited as a log-out with `detail`. */
function endSession(token: string, detail: string | null): void {
  const db = getDb();
  const account = sessionAccount(token);
  db.prepare("delete from sessions where token_sha256 = ? or expires_at <= ?").run(sha256(token), now());
  if (account) audit(account.username, "log-out", null, detail);
}
