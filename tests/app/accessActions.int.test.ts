/**
 * A server action with and without log-in: with no account it acts as "local user"; once an account exists, a request
 * without a session is refused with the typed value kept and nothing changed, and a signed-in request is audited under
 * the account's user name. SQLite in memory; the test, account and password are INVENTED.
 */
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";

vi.mock("next/cache", () => ({ revalidatePath: () => undefined }));

import { SESSION_COOKIE, SESSION_NEEDED } from "../../app/access";
import { saveLabel } from "../../app/tests/[id]/patient/actions";
import { overrideThreshold } from "../../app/tests/[id]/actions";
import { createAccount, logIn } from "../../lib/store/accounts";
import { closeDb } from "../../lib/store/db";
import { getTest, latestSettings, listAudit, saveTest } from "../../lib/store/tests";
import { caseRecord } from "../fixtures/caseRecord";
import { testCookieJar } from "../stubs/nextHeaders";

/** Who changes accounts in these tests (the CLI passes `cli:<os user>`); INVENTED. */
const ADMIN = "cli:operator";

const form = (testId: number, label: string) => {
  const f = new FormData();
  f.set("testId", String(testId));
  f.set("label", label);
  return f;
};

describe("access in a server action (invented test and account)", () => {
  let testId = 0;
  beforeEach(() => {
    process.env.CPET_DB = ":memory:";
    closeDb();
    testCookieJar.clear();
    testId = saveTest({ uploadId: null, label: "Case A (invented)", record: null, columns: [], issues: [] });
  });
  afterEach(() => {
    testCookieJar.clear();
    closeDb();
  });

  it("without accounts, acts as the local user", async () => {
    expect(await saveLabel({}, form(testId, "Case B (invented)"))).toMatchObject({ ok: expect.any(String) });
    expect(getTest(testId)?.label).toBe("Case B (invented)");
    expect(listAudit(testId)[0].actor).toBe("local user");
  });

  it("with an account: refused without a session (typed value kept, nothing changed), audited under the account with one", async () => {
    expect(
      createAccount(
        {
          username: "jdoe",
          displayName: "Dr J Doe (invented)",
          role: "physiologist",
          password: "correct horse battery",
        },
        ADMIN,
      ).ok,
    ).toBe(true);
    expect(await saveLabel({}, form(testId, "Case C (invented)"))).toEqual({ error: SESSION_NEEDED, value: "Case C (invented)" });
    expect(getTest(testId)?.label).toBe("Case A (invented)");

    testCookieJar.set(SESSION_COOKIE, "a-token-that-was-never-issued");
    expect(await saveLabel({}, form(testId, "Case C (invented)"))).toMatchObject({ error: SESSION_NEEDED });

    const session = await logIn("jdoe", "correct horse battery");
    if (!session.ok) throw new Error("log-in refused");
    testCookieJar.set(SESSION_COOKIE, session.token);
    expect(await saveLabel({}, form(testId, "Case C (invented)"))).toMatchObject({ ok: expect.any(String) });
    expect(getTest(testId)?.label).toBe("Case C (invented)");
    expect(listAudit(testId)[0].actor).toBe("jdoe");
  });
});

describe("a reviewer override without a reason (invented demo case)", () => {
  beforeEach(() => {
    process.env.CPET_DB = ":memory:";
    closeDb();
    testCookieJar.clear();
  });
  afterEach(() => closeDb());

  it("is refused by the server with its own words and the typed values kept, whatever the browser checked", async () => {
    const testId = saveTest({
      uploadId: null,
      label: "Normal adult (invented)",
      record: await caseRecord("normal-adult"),
      columns: [],
      issues: [],
    });
    const f = new FormData();
    f.set("testId", String(testId));
    f.set("which", "vt2");
    f.set("vo2MlMin", "2100");
    f.set("by", "E2E");
    f.set("reason", "  ");
    f.set("versionToken", "");
    const answer = await overrideThreshold({}, f);
    expect(answer.errors?.reason).toMatch(/^Give the reason/);
    expect(answer.values?.vo2MlMin).toBe("2100");
    expect(latestSettings(testId)?.settings.overrides ?? []).toEqual([]);
  });
});
