/**
 * Reading a test's data leaves a trace: a report PDF download, an original-file download and opening the report page
 * are audited with the actor ("local user" without log-in, the account's user name signed in) and the test; a refused
 * or missing download writes nothing; page views are written at most once per actor and test per
 * REPORT_VIEW_AUDIT_MINUTES. SQLite in memory; the test is the INVENTED normal-adult demo case (tests/fixtures/cases),
 * the account and password are INVENTED.
 */
import fs from "node:fs";
import path from "node:path";
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";

vi.mock("next/cache", () => ({ revalidatePath: () => undefined }));

import { SESSION_COOKIE } from "../../app/access";
import { GET as getPdf } from "../../app/api/tests/[id]/report/pdf/route";
import { GET as getUpload } from "../../app/api/uploads/[id]/route";
import ReportPage from "../../app/tests/[id]/report/page";
import TestPage from "../../app/tests/[id]/page";
import InputsPage from "../../app/tests/[id]/inputs/page";
import { createAccount, logIn } from "../../lib/store/accounts";
import { verifyAuditChain } from "../../lib/store/auditTrail";
import { closeDb, getDb } from "../../lib/store/db";
import { saveTest, saveUpload } from "../../lib/store/tests";
import { caseRecord } from "../fixtures/caseRecord";
import { testCookieJar } from "../stubs/nextHeaders";

const CSV = path.join(__dirname, "..", "fixtures", "cases", "normal-adult.csv");

type Entry = { actor: string | null; action: string; test_id: number | null; detail: string | null };
const entries = (action: string) =>
  getDb().prepare("select actor, action, test_id, detail from audit where action = ? order by id").all(action) as Entry[];

const pdf = (testId: number) =>
  getPdf(new Request(`http://localhost/api/tests/${testId}/report/pdf`), { params: Promise.resolve({ id: String(testId) }) });
const upload = (uploadId: number) =>
  getUpload(new Request(`http://localhost/api/uploads/${uploadId}`), { params: Promise.resolve({ id: String(uploadId) }) });
const openReportPage = (testId: number) => ReportPage({ params: Promise.resolve({ id: String(testId) }) });

describe("downloads and report views are audited (invented test and account)", () => {
  let testId = 0;
  let uploadId = 0;
  let bytes: Buffer;
  beforeEach(async () => {
    process.env.CPET_DB = ":memory:";
    closeDb();
    testCookieJar.clear();
    bytes = fs.readFileSync(CSV);
    uploadId = saveUpload("normal-adult.csv", new Uint8Array(bytes)).id;
    testId = saveTest({
      uploadId,
      label: "Normal adult (invented)",
      record: await caseRecord("normal-adult"),
      columns: [],
      issues: [],
    });
  });
  afterEach(() => {
    testCookieJar.clear();
    closeDb();
  });

  it("without log-in: the PDF and the original file are audited under the local user, with the test", async () => {
    const res = await pdf(testId);
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toBe("application/pdf");
    expect(
      Buffer.from(await res.arrayBuffer())
        .subarray(0, 5)
        .toString(),
    ).toBe("%PDF-");
    expect(entries("report-pdf-downloaded")).toEqual([
      {
        actor: "local user",
        action: "report-pdf-downloaded",
        test_id: testId,
        detail: expect.stringMatching(/^report \d+ \(version 1, cpet-report-test\d+-v1-draft\.pdf\)$/),
      },
    ]);

    const file = await upload(uploadId);
    expect(file.status).toBe(200);
    expect(Buffer.from(await file.arrayBuffer()).equals(bytes)).toBe(true);
    const sha = getDb().prepare("select sha256 from uploads where id = ?").get(uploadId) as { sha256: string };
    expect(entries("original-file-downloaded")).toEqual([
      {
        actor: "local user",
        action: "original-file-downloaded",
        test_id: testId,
        detail: `upload ${uploadId} “normal-adult.csv” (sha256 ${sha.sha256})`,
      },
    ]);

    // every download is written, not only the first
    await pdf(testId);
    expect(entries("report-pdf-downloaded")).toHaveLength(2);
    // nothing to send, nothing written
    expect((await upload(uploadId + 100)).status).toBe(404);
    expect((await pdf(testId + 100)).status).toBe(404);
    expect(entries("original-file-downloaded")).toHaveLength(1);
    expect(entries("report-pdf-downloaded")).toHaveLength(2);
    expect(verifyAuditChain().ok).toBe(true);
  });

  it("signed in: downloads are audited under the account; refused ones (no session) write nothing", async () => {
    expect(
      createAccount(
        { username: "jdoe", displayName: "Dr J Doe (invented)", role: "clinician", password: "correct horse battery" },
        "cli:operator",
      ).ok,
    ).toBe(true);
    expect((await pdf(testId)).status).toBe(401);
    expect((await upload(uploadId)).status).toBe(401);
    expect(entries("report-pdf-downloaded")).toEqual([]);
    expect(entries("original-file-downloaded")).toEqual([]);

    const session = await logIn("jdoe", "correct horse battery");
    if (!session.ok) throw new Error("log-in refused");
    testCookieJar.set(SESSION_COOKIE, session.token);
    expect((await pdf(testId)).status).toBe(200);
    expect((await upload(uploadId)).status).toBe(200);
    expect(entries("report-pdf-downloaded").map((e) => [e.actor, e.test_id])).toEqual([["jdoe", testId]]);
    expect(entries("original-file-downloaded").map((e) => [e.actor, e.test_id])).toEqual([["jdoe", testId]]);
  });

  it("opening the report page is audited once per actor and test within the window", async () => {
    await openReportPage(testId);
    await openReportPage(testId);
    expect(entries("report-viewed")).toEqual([
      {
        actor: "local user",
        action: "report-viewed",
        test_id: testId,
        detail: expect.stringMatching(/^report \d+ \(version 1, draft\)$/),
      },
    ]);

    createAccount(
      { username: "jdoe", displayName: "Dr J Doe (invented)", role: "clinician", password: "correct horse battery" },
      "cli:operator",
    );
    const session = await logIn("jdoe", "correct horse battery");
    if (!session.ok) throw new Error("log-in refused");
    testCookieJar.set(SESSION_COOKIE, session.token);
    await openReportPage(testId);
    await openReportPage(testId);
    expect(entries("report-viewed").map((e) => e.actor)).toEqual(["local user", "jdoe"]);
  });

  it("opening the test's own pages (analysis, inputs) is audited as a view of that test, once per actor within the window", async () => {
    await TestPage({ params: Promise.resolve({ id: String(testId) }) });
    await InputsPage({ params: Promise.resolve({ id: String(testId) }) });
    await TestPage({ params: Promise.resolve({ id: String(testId) }) });
    expect(entries("test-viewed")).toEqual([
      { actor: "local user", action: "test-viewed", test_id: testId, detail: "analysis page" },
    ]);
    expect(verifyAuditChain().ok).toBe(true);
  }, 60_000);
});
