/**
 * Log-in accounts and sessions (lib/store/accounts), on SQLite in memory. User names, display names and passwords here
 * are INVENTED.
 */
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import {
  LOCKOUT_FAILURES,
  LOCKOUT_MINUTES,
  LOG_IN_REFUSED,
  SESSION_HOURS,
  SESSION_IDLE_MINUTES,
  confirmPassword,
  accountsEnabled,
  createAccount,
  hashPassword,
  listAccounts,
  logIn,
  logOut,
  sessionAccount,
  unlockAccount,
  lockedOut,
  setAccountDisabled,
  setAccountPassword,
  verifyPassword,
} from "../../lib/store/accounts";
import { closeDb, getDb } from "../../lib/store/db";

/** Who changes accounts in these tests (the CLI passes `cli:<os user>`); INVENTED. */
const ADMIN = "cli:operator";

const PASSWORD = "correct horse battery"; // INVENTED
const clinician = () =>
  createAccount({ username: "jdoe", displayName: "Dr J Doe (invented)", role: "clinician", password: PASSWORD }, ADMIN);

describe("password hashing", () => {
  it("checks a password against the scrypt test vector of RFC 7914 §12 (Percival & Josefsson 2016; vector recalled, node:crypto gives the same)", async () => {
    // scrypt(P = "password", S = "NaCl", N = 1024, r = 8, p = 16, dkLen = 64)
    const rfc =
      "fdbabe1c9d3472007856e7190d01e9fe7c6ad7cbc8237830e77376634b3731622eaf30d92e22a3886ff109279d9830dac727afb94a83ee6d8360cbdfa2cc0640";
    const stored = [
      "scrypt",
      1024,
      8,
      16,
      Buffer.from("NaCl").toString("base64"),
      Buffer.from(rfc, "hex").toString("base64"),
    ].join("$");
    expect(await verifyPassword("password", stored)).toBe(true);
    expect(await verifyPassword("Password", stored)).toBe(false);
  });

  it("salts each hash (two hashes of one password differ) and verifies its own hashes", async () => {
    const a = hashPassword(PASSWORD);
    const b = hashPassword(PASSWORD);
    expect(a).not.toBe(b);
    expect(a.split("$").slice(0, 4)).toEqual(["scrypt", "131072", "8", "1"]);
    expect(await verifyPassword(PASSWORD, a)).toBe(true);
    expect(await verifyPassword(PASSWORD + " ", a)).toBe(false);
    expect(await verifyPassword(PASSWORD, "not-a-hash")).toBe(false);
  });
});

describe("accounts and sessions", () => {
  beforeEach(() => {
    process.env.CPET_DB = ":memory:";
    closeDb();
  });
  afterEach(() => closeDb());

  it("needs no log-in until an enabled account exists, and again once every account is disabled", () => {
    expect(accountsEnabled()).toBe(false);
    expect(clinician().ok).toBe(true);
    expect(accountsEnabled()).toBe(true);
    expect(setAccountDisabled("jdoe", true, ADMIN)).toBe(true);
    expect(accountsEnabled()).toBe(false);
    expect(listAccounts().map((a) => [a.username, a.disabled])).toEqual([["jdoe", true]]);
  });

  it("refuses bad user names, roles, short passwords, passwords holding the user name, taken names and names the PDF cannot print", () => {
    const base = { displayName: "Dr A (invented)", role: "clinician" as const, password: PASSWORD };
    expect(createAccount({ ...base, username: "a" }, ADMIN).ok).toBe(false);
    expect(createAccount({ ...base, username: "has space" }, ADMIN).ok).toBe(false);
    expect(createAccount({ ...base, username: "ann", password: "short" }, ADMIN)).toEqual({
      ok: false,
      reason: "the password must have at least 10 characters",
    });
    expect(createAccount({ ...base, username: "ann", password: "ann-is-my-password" }, ADMIN).ok).toBe(false);
    expect(createAccount({ ...base, username: "ann", role: "nurse" as never }, ADMIN).ok).toBe(false);
    expect(createAccount({ ...base, username: "ann", displayName: "Dr 王 (invented)" }, ADMIN)).toMatchObject({ ok: false });
    expect(createAccount({ ...base, username: "Ann" }, ADMIN)).toMatchObject({ ok: true, account: { username: "ann" } });
    expect(createAccount({ ...base, username: "ann" }, ADMIN)).toEqual({ ok: false, reason: 'user name "ann" is taken' });
  });

  it("opens a session for the right password only, with one message for every refusal, and audits each attempt", async () => {
    clinician();
    createAccount({ username: "off", displayName: "Off (invented)", role: "physiologist", password: PASSWORD }, ADMIN);
    setAccountDisabled("off", true, ADMIN);
    expect(await logIn("jdoe", "wrong password here")).toEqual({ ok: false, reason: LOG_IN_REFUSED });
    expect(await logIn("nobody", PASSWORD)).toEqual({ ok: false, reason: LOG_IN_REFUSED });
    expect(await logIn("off", PASSWORD)).toEqual({ ok: false, reason: LOG_IN_REFUSED });
    const ok = await logIn(" JDoe ", PASSWORD);
    expect(ok.ok).toBe(true);
    if (!ok.ok) return;
    expect(ok.token).toMatch(/^[A-Za-z0-9_-]{43}$/);
    expect(sessionAccount(ok.token)?.username).toBe("jdoe");
    expect(sessionAccount(ok.token + "x")).toBeNull();
    // the token itself is never stored, only its SHA-256
    const stored = getDb().prepare("select token_sha256 from sessions").all() as { token_sha256: string }[];
    expect(stored).toHaveLength(1);
    expect(stored[0].token_sha256).not.toContain(ok.token);
    const audit = getDb().prepare("select actor, action, detail from audit order by id").all();
    expect(audit).toEqual(
      expect.arrayContaining([
        { actor: "jdoe", action: "log-in-failed", detail: "wrong password" },
        { actor: "nobody", action: "log-in-failed", detail: "unknown user name" },
        { actor: "off", action: "log-in-failed", detail: "account disabled" },
        { actor: "jdoe", action: "log-in", detail: null },
      ]),
    );
  });

  it("ends a session on log-out, after SESSION_HOURS, after SESSION_IDLE_MINUTES unused, when the account is disabled and when its password is set again", async () => {
    clinician();
    const t0 = new Date("2026-12-05T08:00:00Z");
    const a = await logIn("jdoe", PASSWORD, t0);
    if (!a.ok) throw new Error("log-in refused");
    // used every 20 min it lives until SESSION_HOURS after log-in, and not a second longer
    const minutes = (m: number) => new Date(t0.getTime() + m * 60_000);
    for (let m = 20; m < SESSION_HOURS * 60; m += 20) expect(sessionAccount(a.token, minutes(m))?.username).toBe("jdoe");
    expect(sessionAccount(a.token, minutes(SESSION_HOURS * 60 - 1 / 60))?.username).toBe("jdoe");
    expect(sessionAccount(a.token, minutes(SESSION_HOURS * 60 + 1 / 60))).toBeNull();
    // left unused for SESSION_IDLE_MINUTES it ends (NIST SP 800-63B, 30 min, recalled)
    const idle = await logIn("jdoe", PASSWORD, t0);
    if (!idle.ok) throw new Error("log-in refused");
    expect(sessionAccount(idle.token, minutes(SESSION_IDLE_MINUTES - 1))?.username).toBe("jdoe");
    expect(sessionAccount(idle.token, minutes(2 * SESSION_IDLE_MINUTES))).toBeNull();

    const b = await logIn("jdoe", PASSWORD);
    if (!b.ok) throw new Error("log-in refused");
    logOut(b.token);
    expect(sessionAccount(b.token)).toBeNull();

    const c = await logIn("jdoe", PASSWORD);
    if (!c.ok) throw new Error("log-in refused");
    setAccountDisabled("jdoe", true, ADMIN);
    setAccountDisabled("jdoe", false, ADMIN);
    expect(sessionAccount(c.token)).toBeNull();

    const d = await logIn("jdoe", PASSWORD);
    if (!d.ok) throw new Error("log-in refused");
    expect(setAccountPassword("jdoe", "another long password", ADMIN).ok).toBe(true);
    expect(sessionAccount(d.token)).toBeNull();
    expect((await logIn("jdoe", PASSWORD)).ok).toBe(false);
    expect((await logIn("jdoe", "another long password")).ok).toBe(true);
  });

  it(`refuses even the right password after ${LOCKOUT_FAILURES} failures within ${LOCKOUT_MINUTES} minutes, and accepts it once they pass`, async () => {
    clinician();
    const t0 = new Date();
    for (let i = 0; i < LOCKOUT_FAILURES; i++) expect((await logIn("jdoe", "wrong password here", t0)).ok).toBe(false);
    const locked = await logIn("jdoe", PASSWORD, t0);
    expect(locked).toMatchObject({ ok: false });
    expect(locked.ok ? "" : locked.reason).toContain("Too many failed attempts");
    expect((await logIn("jdoe", PASSWORD, new Date(t0.getTime() + (LOCKOUT_MINUTES + 1) * 60_000))).ok).toBe(true);
  });

  it("attempts refused while locked do not keep the lock going, and an unlock lifts it at once", async () => {
    clinician();
    const t0 = new Date();
    for (let i = 0; i < LOCKOUT_FAILURES; i++) await logIn("jdoe", "wrong password here", t0);
    expect(lockedOut("jdoe", t0)).toBe(true);
    // an attacker keeps trying during the lock: refused, audited as locked, not counted
    for (let i = 0; i < 3; i++) expect((await logIn("jdoe", "wrong password here", t0)).ok).toBe(false);
    const actions = (getDb().prepare("select action from audit where actor = 'jdoe'").all() as { action: string }[]).map(
      (r) => r.action,
    );
    expect(actions.filter((a) => a === "log-in-failed")).toHaveLength(LOCKOUT_FAILURES);
    expect(actions.filter((a) => a === "log-in-locked")).toHaveLength(3);
    expect(unlockAccount("jdoe", ADMIN)).toBe(true);
    expect(lockedOut("jdoe")).toBe(false);
    expect((await logIn("jdoe", PASSWORD)).ok).toBe(true);
  });

  it("a signature's password check counts a wrong password as a failed log-in", async () => {
    clinician();
    expect(await confirmPassword("jdoe", PASSWORD)).toBe(true);
    expect(await confirmPassword("jdoe", "not the password")).toBe(false);
    const failed = getDb().prepare("select detail from audit where action = 'log-in-failed' and actor = 'jdoe'").all();
    expect(failed).toEqual([{ detail: "wrong password at signing" }]);
    expect(await confirmPassword("nobody", PASSWORD)).toBe(false);
  });
});
