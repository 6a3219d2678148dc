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
  accountsEnabled,
  createAccount,
  hashPassword,
  listAccounts,
  logIn,
  logOut,
  sessionAccount,
  setAccountDisabled,
  setAccountPassword,
  verifyPassword,
} from "../../lib/store/accounts";
import { closeDb, getDb } from "../../lib/store/db";

const PASSWORD = "correct horse battery"; // INVENTED
const clinician = () =>
  createAccount({ username: "jdoe", displayName: "Dr J Doe (invented)", role: "clinician", password: PASSWORD });

describe("password hashing", () => {
  it("checks a password against the scrypt test vector of RFC 7914 §12 (Percival & Josefsson 2016; vector recalled, node:crypto gives the same)", () => {
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
    expect(verifyPassword("password", stored)).toBe(true);
    expect(verifyPassword("Password", stored)).toBe(false);
  });

  it("salts each hash (two hashes of one password differ) and verifies its own hashes", () => {
    const a = hashPassword(PASSWORD);
    const b = hashPassword(PASSWORD);
    expect(a).not.toBe(b);
    expect(a.split("$").slice(0, 4)).toEqual(["scrypt", "131072", "8", "1"]);
    expect(verifyPassword(PASSWORD, a)).toBe(true);
    expect(verifyPassword(PASSWORD + " ", a)).toBe(false);
    expect(verifyPassword(PASSWORD, "not-a-hash")).toBe(false);
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
    expect(setAccountDisabled("jdoe", true)).toBe(true);
    expect(accountsEnabled()).toBe(false);
    expect(listAccounts().map((a) => [a.username, a.disabled])).toEqual([["jdoe", true]]);
  });

  it("refuses bad user names, roles, short passwords, passwords holding the user name, taken names and names the PDF cannot print", () => {
    const base = { displayName: "Dr A (invented)", role: "clinician" as const, password: PASSWORD };
    expect(createAccount({ ...base, username: "a" }).ok).toBe(false);
    expect(createAccount({ ...base, username: "has space" }).ok).toBe(false);
    expect(createAccount({ ...base, username: "ann", password: "short" })).toEqual({
      ok: false,
      reason: "the password must have at least 10 characters",
    });
    expect(createAccount({ ...base, username: "ann", password: "ann-is-my-password" }).ok).toBe(false);
    expect(createAccount({ ...base, username: "ann", role: "nurse" as never }).ok).toBe(false);
    expect(createAccount({ ...base, username: "ann", displayName: "Dr 王 (invented)" })).toMatchObject({ ok: false });
    expect(createAccount({ ...base, username: "Ann" })).toMatchObject({ ok: true, account: { username: "ann" } });
    expect(createAccount({ ...base, username: "ann" })).toEqual({ ok: false, reason: 'user name "ann" is taken' });
  });

  it("opens a session for the right password only, with one message for every refusal, and audits each attempt", () => {
    clinician();
    createAccount({ username: "off", displayName: "Off (invented)", role: "physiologist", password: PASSWORD });
    setAccountDisabled("off", true);
    expect(logIn("jdoe", "wrong password here")).toEqual({ ok: false, reason: LOG_IN_REFUSED });
    expect(logIn("nobody", PASSWORD)).toEqual({ ok: false, reason: LOG_IN_REFUSED });
    expect(logIn("off", PASSWORD)).toEqual({ ok: false, reason: LOG_IN_REFUSED });
    const ok = logIn(" JDoe ", PASSWORD);
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

  it("ends a session on log-out, after SESSION_HOURS, when the account is disabled and when its password is set again", () => {
    clinician();
    const t0 = new Date("2026-12-05T08:00:00Z");
    const a = logIn("jdoe", PASSWORD, t0);
    if (!a.ok) throw new Error("log-in refused");
    const justBefore = new Date(t0.getTime() + SESSION_HOURS * 3_600_000 - 1000);
    const justAfter = new Date(t0.getTime() + SESSION_HOURS * 3_600_000 + 1000);
    expect(sessionAccount(a.token, justBefore)?.username).toBe("jdoe");
    expect(sessionAccount(a.token, justAfter)).toBeNull();

    const b = logIn("jdoe", PASSWORD);
    if (!b.ok) throw new Error("log-in refused");
    logOut(b.token);
    expect(sessionAccount(b.token)).toBeNull();

    const c = logIn("jdoe", PASSWORD);
    if (!c.ok) throw new Error("log-in refused");
    setAccountDisabled("jdoe", true);
    setAccountDisabled("jdoe", false);
    expect(sessionAccount(c.token)).toBeNull();

    const d = logIn("jdoe", PASSWORD);
    if (!d.ok) throw new Error("log-in refused");
    expect(setAccountPassword("jdoe", "another long password").ok).toBe(true);
    expect(sessionAccount(d.token)).toBeNull();
    expect(logIn("jdoe", PASSWORD).ok).toBe(false);
    expect(logIn("jdoe", "another long password").ok).toBe(true);
  });

  it(`refuses even the right password after ${LOCKOUT_FAILURES} failures within ${LOCKOUT_MINUTES} minutes, and accepts it once they pass`, () => {
    clinician();
    const t0 = new Date();
    for (let i = 0; i < LOCKOUT_FAILURES; i++) expect(logIn("jdoe", "wrong password here", t0).ok).toBe(false);
    const locked = logIn("jdoe", PASSWORD, t0);
    expect(locked).toMatchObject({ ok: false });
    expect(locked.ok ? "" : locked.reason).toContain("Too many failed attempts");
    expect(logIn("jdoe", PASSWORD, new Date(t0.getTime() + (LOCKOUT_MINUTES + 1) * 60_000)).ok).toBe(true);
  });
});
