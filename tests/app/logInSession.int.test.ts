/**
 * Signing in from a browser that already holds a session ends that session (one browser, one live session), and the
 * session cookie is `secure` only when a trusted proxy says the request came over HTTPS (`CPET_TRUST_PROXY=1` and
 * `X-Forwarded-Proto: https`), never on a client's word alone. SQLite in memory; accounts and passwords are INVENTED.
 */
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";

vi.mock("next/cache", () => ({ revalidatePath: () => undefined }));

import { SESSION_COOKIE, sessionCookieSecure } from "../../app/access";
import { logInAction } from "../../app/login/actions";
import { createAccount, logIn, sessionAccount } from "../../lib/store/accounts";
import { verifyAuditChain } from "../../lib/store/auditTrail";
import { closeDb, getDb } from "../../lib/store/db";
import { testCookieJar, testRequestHeaders } from "../stubs/nextHeaders";

const PASSWORD = "correct horse battery"; // INVENTED
const account = (username: string) =>
  createAccount({ username, displayName: `${username} (invented)`, role: "clinician", password: PASSWORD }, "cli:operator");

const logOuts = () =>
  getDb().prepare("select actor, detail from audit where action = 'log-out' order by id").all() as {
    actor: string;
    detail: string | null;
  }[];

/** Submit the log-in form as the browser holding the test cookie jar would; returns where it was sent, or the error. */
async function submitLogIn(username: string, password: string): Promise<{ redirectedTo?: string; error?: string }> {
  const form = new FormData();
  form.set("username", username);
  form.set("password", password);
  form.set("next", "/compare");
  try {
    const state = await logInAction({}, form);
    return { error: state.error };
  } catch (err) {
    const digest = (err as { digest?: string }).digest ?? "";
    if (!digest.startsWith("NEXT_REDIRECT")) throw err;
    return { redirectedTo: digest.split(";")[2] };
  }
}

describe("one live session per browser (invented accounts)", () => {
  beforeEach(() => {
    process.env.CPET_DB = ":memory:";
    closeDb();
    testCookieJar.clear();
    testRequestHeaders.clear();
  });
  afterEach(() => {
    testCookieJar.clear();
    testRequestHeaders.clear();
    delete process.env.CPET_TRUST_PROXY;
    closeDb();
  });

  it("a new log-in given the browser's earlier session ends it, audited as a log-out; a failed one leaves it", async () => {
    account("jdoe");
    const first = await logIn("jdoe", PASSWORD);
    if (!first.ok) throw new Error("log-in refused");
    expect((await logIn("jdoe", "wrong password here", new Date(), first.token)).ok).toBe(false);
    expect(sessionAccount(first.token)?.username).toBe("jdoe");

    const second = await logIn("jdoe", PASSWORD, new Date(), first.token);
    if (!second.ok) throw new Error("log-in refused");
    expect(sessionAccount(first.token)).toBeNull();
    expect(sessionAccount(second.token)?.username).toBe("jdoe");
    expect(getDb().prepare("select count(*) as n from sessions").get()).toEqual({ n: 1 });
    expect(logOuts()).toEqual([{ actor: "jdoe", detail: "ended by a new log-in from the same browser" }]);

    // without the earlier token (another browser), both stay: one session per browser, not per account
    const elsewhere = await logIn("jdoe", PASSWORD);
    if (!elsewhere.ok) throw new Error("log-in refused");
    expect(sessionAccount(second.token)?.username).toBe("jdoe");
    expect(sessionAccount(elsewhere.token)?.username).toBe("jdoe");
  });

  it("the log-in form ends the session its browser already held, also when another person signs in there", async () => {
    account("jdoe");
    account("asmith");
    expect(await submitLogIn("jdoe", PASSWORD)).toEqual({ redirectedTo: "/compare" });
    const jdoeToken = testCookieJar.get(SESSION_COOKIE)!;
    expect(sessionAccount(jdoeToken)?.username).toBe("jdoe");

    expect(await submitLogIn("jdoe", "wrong password here")).toMatchObject({ error: expect.any(String) });
    expect(testCookieJar.get(SESSION_COOKIE)).toBe(jdoeToken);
    expect(sessionAccount(jdoeToken)?.username).toBe("jdoe");

    expect(await submitLogIn("asmith", PASSWORD)).toEqual({ redirectedTo: "/compare" });
    const asmithToken = testCookieJar.get(SESSION_COOKIE)!;
    expect(asmithToken).not.toBe(jdoeToken);
    expect(sessionAccount(jdoeToken)).toBeNull();
    expect(sessionAccount(asmithToken)?.username).toBe("asmith");
    expect(logOuts()).toEqual([{ actor: "jdoe", detail: "ended by a new log-in from the same browser" }]);
    expect(verifyAuditChain().ok).toBe(true);
  });

  it("sets the cookie secure only when a proxy is trusted and says HTTPS", async () => {
    account("jdoe");
    testRequestHeaders.set("x-forwarded-proto", "https");
    await submitLogIn("jdoe", PASSWORD);
    expect(testCookieJar.optionsOf(SESSION_COOKIE)).toMatchObject({ httpOnly: true, sameSite: "lax", secure: false });

    process.env.CPET_TRUST_PROXY = "1";
    await submitLogIn("jdoe", PASSWORD);
    expect(testCookieJar.optionsOf(SESSION_COOKIE)).toMatchObject({ secure: true });

    testRequestHeaders.set("x-forwarded-proto", "http");
    await submitLogIn("jdoe", PASSWORD);
    expect(testCookieJar.optionsOf(SESSION_COOKIE)).toMatchObject({ secure: false });
  });

  it("reads the header only with CPET_TRUST_PROXY=1, and only its first value", () => {
    expect(sessionCookieSecure("https", {})).toBe(false);
    expect(sessionCookieSecure("https", { CPET_TRUST_PROXY: "true" })).toBe(false);
    expect(sessionCookieSecure("https", { CPET_TRUST_PROXY: "1" })).toBe(true);
    expect(sessionCookieSecure(" HTTPS ", { CPET_TRUST_PROXY: "1" })).toBe(true);
    expect(sessionCookieSecure("https, http", { CPET_TRUST_PROXY: "1" })).toBe(true);
    expect(sessionCookieSecure("http, https", { CPET_TRUST_PROXY: "1" })).toBe(false);
    expect(sessionCookieSecure(null, { CPET_TRUST_PROXY: "1" })).toBe(false);
  });
});
