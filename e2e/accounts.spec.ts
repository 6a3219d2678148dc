import { execFileSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { expect, test, type Page } from "@playwright/test";
import { E2E_ACCOUNTS, accountsPort } from "./fixtures/accounts";

// The second end-to-end server: its database holds two INVENTED accounts, so it asks everyone to sign in.
const base = `http://127.0.0.1:${accountsPort()}`;
test.use({ baseURL: base });

async function signIn(page: Page, who: keyof typeof E2E_ACCOUNTS, password?: string) {
  const a = E2E_ACCOUNTS[who];
  await page.getByTestId("log-in-username").fill(a.username);
  await page.getByTestId("log-in-password").fill(password ?? a.password);
  await page.getByTestId("log-in-submit").click();
}

test("with accounts, nothing is shown or sent without signing in; the health check stays open", async ({ page, request }) => {
  await page.goto("/");
  await page.waitForURL(/\/login\?next=%2F$/);
  await expect(page.getByTestId("log-in-form")).toBeVisible();
  await expect(page.getByTestId("clinical-caution")).toContainText("qualified clinician");
  await page.goto("/tests/1/report");
  await page.waitForURL(/\/login\?next=%2Ftests%2F1%2Freport$/);
  for (const url of ["/api/tests/1/report/pdf", "/api/uploads/1", "/profiles/names"]) {
    const res = await request.get(url, { maxRedirects: 0 });
    expect(res.status(), url).toBe(401);
  }
  const health = await request.get("/api/health");
  expect(health.status()).toBe(200);
  // no page may be framed by another site, nor a download sniffed
  expect(health.headers()["x-frame-options"]).toBe("DENY");
  expect(health.headers()["content-security-policy"]).toBe("frame-ancestors 'none'");
  expect(health.headers()["x-content-type-options"]).toBe("nosniff");
  // a redirect to another site is not followed after signing in
  await page.goto("/login?next=//example.org/");
  await signIn(page, "physiologist");
  await page.waitForURL(`${base}/`);
});

test("a wrong password is refused with one message; a physiologist works on a report but cannot sign it", async ({ page }) => {
  await page.goto("/login");
  await signIn(page, "physiologist", "not the password at all");
  await expect(page.getByTestId("log-in-error")).toContainText("The user name or password is not right");
  await expect(page.getByTestId("log-in-username")).toHaveValue(E2E_ACCOUNTS.physiologist.username);
  await signIn(page, "physiologist");
  await page.waitForURL(`${base}/`);
  await expect(page.getByTestId("account-bar")).toContainText(`${E2E_ACCOUNTS.physiologist.name} (physiologist)`);
  await page
    .getByRole("link", { name: /Demo \(invented\)/ })
    .first()
    .click();
  await page.waitForURL(/\/tests\/\d+$/);
  await page.goto(`${page.url()}/report`);
  await expect(page.getByTestId("draft-mark")).toContainText("DRAFT");
  await expect(page.getByTestId("sign-as")).toContainText(`You sign as ${E2E_ACCOUNTS.physiologist.name}`);
  await expect(page.getByTestId("sign-role-note")).toContainText("Only a clinician account can sign");
  await expect(page.getByTestId("sign-submit")).toBeDisabled();
  await expect(page.getByTestId("signer")).toHaveCount(0);
  await page.goto(page.url().replace(/\/report$/, ""));
  await expect(page.getByTestId("report-standing")).toContainText("draft version 1, not signed");
  await expect(page.getByTestId("report-standing")).toContainText("not a signed report");
  await page.goto(`${page.url()}/report`);
  // signing out ends the session: the report asks for a log-in again
  const reportUrl = page.url();
  await page.getByTestId("log-out").click();
  await page.waitForURL(/\/login$/);
  await page.goto(reportUrl);
  await page.waitForURL(/\/login\?next=/);
});

test("a clinician signs with the account: page and PDF name the account, not a typed name", async ({ page }) => {
  await page.goto("/");
  await page.waitForURL(/\/login/);
  await signIn(page, "clinician");
  await page.waitForURL(`${base}/`);
  await page
    .getByRole("link", { name: /Demo \(invented\)/ })
    .first()
    .click();
  await page.waitForURL(/\/tests\/\d+$/);
  const testId = Number(/\/tests\/(\d+)/.exec(page.url())![1]);
  await page.goto(`/tests/${testId}/report`);
  await expect(page.getByTestId("draft-workspace")).toHaveAttribute("data-ready", "true");
  await expect(page.getByTestId("sign-as")).toContainText(`You sign as ${E2E_ACCOUNTS.clinician.name}`);
  await page.getByTestId("attest").check();
  // the signature asks for the password again: a wrong one is refused, nothing signed
  await page.getByTestId("sign-password").fill("not the password at all");
  await page.getByTestId("sign-submit").click();
  await expect(page.getByTestId("sign-error")).toContainText("the password is not right");
  await expect(page.getByTestId("draft-mark")).toContainText("DRAFT");
  await page.getByTestId("sign-password").fill(E2E_ACCOUNTS.clinician.password);
  await page.getByTestId("sign-submit").click();
  await expect(page.getByTestId("signature")).toContainText(`Signed by ${E2E_ACCOUNTS.clinician.name}`);
  await expect(page.getByTestId("signer-identity")).toContainText(
    `signed in as the account "${E2E_ACCOUNTS.clinician.username}"`,
  );
  await expect(page.getByTestId("clinical-caution")).toContainText("qualified clinician");

  const pdf = await page.request.get(`/api/tests/${testId}/report/pdf`);
  expect(pdf.status()).toBe(200);
  const file = path.join(os.tmpdir(), `cpet-e2e-account-signed-${process.pid}.pdf`);
  fs.writeFileSync(file, await pdf.body());
  // poppler's pdftotext, as the other PDF checks use
  const text = execFileSync("pdftotext", [file, "-"]).toString().replace(/\s+/g, " ");
  fs.rmSync(file);
  expect(text).toContain(`Signed by ${E2E_ACCOUNTS.clinician.name} (account "${E2E_ACCOUNTS.clinician.username}")`);
  expect(text).not.toContain("not verified");
  expect(text).not.toContain("DRAFT");

  // the register and the analysis view say where the report stands
  await page.goto("/");
  await expect(page.getByTestId(`report-standing-${testId}`)).toHaveText(`signed (version 1, ${E2E_ACCOUNTS.clinician.name})`);
  await page.goto(`/tests/${testId}`);
  await expect(page.getByTestId("report-standing")).toContainText("Report: signed (version 1");
});
