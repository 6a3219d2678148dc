import { execFileSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { expect, test, type Page } from "@playwright/test";

/** Page object for a test's report page (draft editing, signing, PDF). */
class ReportPage {
  constructor(private readonly page: Page) {}

  /** Open the invented demo case from the register and go to its report; returns the test id. */
  /** Open the report of the invented demo case whose register label matches. */
  async openDemoReportByLabel(label: RegExp): Promise<number> {
    await this.page.goto("/");
    await this.page.getByRole("link", { name: label }).click();
    await this.page.waitForURL(/\/tests\/\d+$/);
    const id = Number(/\/tests\/(\d+)/.exec(this.page.url())![1]);
    await this.page.goto(`/tests/${id}/report`);
    await this.ready();
    return id;
  }

  async openDemoReport(): Promise<number> {
    await this.page.goto("/");
    await this.page
      .getByRole("link", { name: /Demo \(invented\)/ })
      .first()
      .click();
    await this.page.waitForURL(/\/tests\/\d+$/);
    const id = Number(/\/tests\/(\d+)/.exec(this.page.url())![1]);
    await this.page.goto(`/tests/${id}/report`);
    await this.ready();
    return id;
  }

  /** Wait until the editor has hydrated: text filled in before that can land beside the server text, not in place of it. */
  async ready() {
    await expect(this.page.getByTestId("draft-workspace")).toHaveAttribute("data-ready", "true");
  }

  section(id: string) {
    return this.page.getByTestId(`section-${id}`);
  }

  async saveDraft() {
    await this.page.getByTestId("draft-save").click();
  }

  /**
   * Sign as a reviewer. The tests share one database, so a demo report another test signed makes this draft an
   * amendment: then `reason` (or, when none is given, a set-up reason) fills the field the form asks for.
   */
  async sign(name: string, attest = true, reason?: string) {
    await this.page.getByTestId("signer").fill(name);
    if (attest) await this.page.getByTestId("attest").check();
    const field = this.page.getByTestId("amendment-reason");
    if (reason !== undefined) await field.fill(reason);
    else if (await field.isVisible()) await field.fill("Signed again by an end-to-end test (e2e set-up).");
    await this.page.getByTestId("sign-submit").click();
  }
}

test("report: edit the draft, keep text through validation, sign, download the PDF, revise", async ({ page }) => {
  const report = new ReportPage(page);
  const testId = await report.openDemoReport();

  // Draft state: prominent DRAFT mark, clinical caution, neutral first text, charts drawn as SVG.
  await expect(page.getByTestId("draft-mark")).toContainText("DRAFT");
  await expect(page.getByTestId("clinical-caution")).toContainText("qualified clinician");
  await expect(report.section("results")).toHaveValue(/Peak VO2 \d+ mL\/min/);
  await expect(page.getByTestId("chart-time-course").locator("svg")).toBeVisible();
  await page.screenshot({ path: "reports/screenshots/report-draft.png", fullPage: true });
  const draftPdf = await page.request.get(`/api/tests/${testId}/report/pdf`);
  expect(draftPdf.status()).toBe(200);
  // Kept for a person to look at (reports/ is not tracked).
  fs.writeFileSync("reports/screenshots/report-draft.pdf", await draftPdf.body());

  // Edit, save, reload: the text is kept.
  const text = "Reviewer's interpretation (e2e): effort and data quality checked.\n\nSecond paragraph.";
  const initialConclusion = await report.section("conclusion").inputValue();
  await report.section("pathway").fill(text);
  await report.saveDraft();
  await expect(page.getByTestId("draft-saved")).toBeVisible();
  await page.reload();
  await report.ready();
  await expect(report.section("pathway")).toHaveValue(text);

  // Too long: refused with a message, the typed text stays in the box, the saved text is unchanged.
  const tooLong = "x".repeat(4001);
  await report.section("conclusion").fill(tooLong);
  await report.saveDraft();
  await expect(page.getByTestId("section-error-conclusion")).toContainText("at most 4000 characters");
  await expect(report.section("conclusion")).toHaveValue(tooLong);
  // Unsaved edits: the page flags them and asks before it is left; the reviewer discards them here.
  await expect(page.getByTestId("draft-unsaved")).toBeVisible();
  const leave = new Promise<string>((resolve) =>
    page.once("dialog", (d) => {
      resolve(d.type());
      void d.accept();
    }),
  );
  await page.reload();
  await report.ready();
  expect(await leave).toBe("beforeunload");
  // The unsaved text survived the reload (kept in the tab), with a notice and a way to discard it.
  await expect(page.getByTestId("restored-notice")).toContainText("Unsaved text from your last visit was restored");
  await expect(report.section("conclusion")).toHaveValue(tooLong);
  await page.getByTestId("discard-restored").click();
  await expect(report.section("conclusion")).toHaveValue(initialConclusion);
  await expect(page.getByTestId("restored-notice")).toHaveCount(0);

  // Signing needs the attestation; a refusal keeps the name typed so far.
  await report.sign("Dr E2E Reviewer", false);
  await expect(page.getByText("Confirm that you have reviewed the report")).toBeVisible();
  await expect(page.getByTestId("signer")).toHaveValue("Dr E2E Reviewer");
  await expect(page.getByTestId("attest")).not.toBeChecked();
  // the keyboard focus goes to the reason, not back to the top of the page
  await expect(page.getByTestId("sign-refusal")).toBeFocused();
  await report.sign("Dr E2E Reviewer");
  await expect(page.getByTestId("signed-by")).toContainText("Signed by Dr E2E Reviewer");
  await expect(page.getByTestId("signed-by")).toBeFocused();
  await expect(page.getByTestId("draft-mark")).toHaveCount(0);
  await expect(page.getByTestId("signed-text")).toContainText("Reviewer's interpretation (e2e)");
  await page.screenshot({ path: "reports/screenshots/report-signed.png", fullPage: true });

  // The PDF link serves a PDF.
  const href = await page.getByTestId("pdf-link").getAttribute("href");
  expect(href).toBe(`/api/tests/${testId}/report/pdf`);
  const res = await page.request.get(href!);
  expect(res.status()).toBe(200);
  expect(res.headers()["content-type"]).toBe("application/pdf");
  const body = await res.body();
  expect(body.subarray(0, 5).toString("latin1")).toBe("%PDF-");
  fs.writeFileSync("reports/screenshots/report-signed.pdf", body);

  // Revising a signed report makes a new draft version; the signed one stays listed.
  await page.getByText("Revise the text").click();
  await report.section("conclusion").fill("Revised conclusion (e2e).");
  await report.saveDraft();
  await expect(page.getByTestId("draft-mark")).toBeVisible();
  await expect(page.getByTestId("report-versions")).toContainText("Version 1: signed by Dr E2E Reviewer");
  await expect(page.getByTestId("report-versions")).toContainText("draft");
  expect((await page.request.get(`/api/tests/${testId}/report/pdf?report=999999`)).status()).toBe(404);
});

test("report: signing signs the text on screen, including edits that were never saved", async ({ page }) => {
  const report = new ReportPage(page);
  const testId = await report.openDemoReportByLabel(/COPD, ventilatory limitation/);
  const typed = "Unsaved conclusion typed just before signing (e2e).";
  await report.section("conclusion").fill(typed);
  // No "Save draft": the page says the text is unsaved and that signing saves exactly this text.
  await expect(page.getByTestId("draft-unsaved")).toBeVisible();
  await expect(page.getByTestId("sign-unsaved-note")).toContainText("Signing saves the text exactly as it is on screen");
  await expect(page.getByTestId("sign-submit")).toHaveText("Save the text on screen and sign");
  await page.screenshot({ path: "reports/screenshots/report-unsaved-before-sign.png", fullPage: true });
  await report.sign("Dr E2E Signer");
  await expect(page.getByTestId("signed-by")).toContainText("Signed by Dr E2E Signer");
  await expect(page.getByTestId("signed-text")).toContainText(typed);
  // After a reload (nothing unsaved now, so no question) the signed version still holds the typed text.
  await page.reload();
  await report.ready();
  await expect(page.getByTestId("signed-text")).toContainText(typed);
  await expect(page.getByTestId("draft-mark")).toHaveCount(0);
  const pdf = await page.request.get(`/api/tests/${testId}/report/pdf`);
  expect(pdf.status()).toBe(200);
  expect(pdf.headers()["content-disposition"]).toMatch(/-signed\.pdf/);
});

/** The PDF's text as poppler's pdftotext reads it (poppler-utils, as the unit tests use), whitespace collapsed. */
function pdfText(pdf: Buffer): string {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "cpet-e2e-pdf-"));
  const file = path.join(dir, "r.pdf");
  fs.writeFileSync(file, pdf);
  const text = execFileSync("pdftotext", [file, "-"]).toString().replace(/\s+/g, " ");
  fs.rmSync(dir, { recursive: true, force: true });
  return text;
}

test("report: a Greek signer's name is signed and printed as typed; characters the PDF lacks are refused by name", async ({
  page,
}) => {
  const report = new ReportPage(page);
  const testId = await report.openDemoReportByLabel(/heart failure assessment/);
  // Chinese characters are not in the PDF's font: refused, named, with what the PDF does print
  await report.sign("Dr 李明");
  await expect(page.getByTestId("sign-error")).toContainText("cannot show 李 明 in the name");
  await expect(page.getByTestId("sign-error")).toContainText(
    "Latin (including Central European and Vietnamese), Greek and Cyrillic",
  );
  // a letter outside the font prints without its mark, and the form says so before signing
  await page.getByTestId("signer").fill("Dr Lǎo");
  await expect(page.getByTestId("signer-pdf-form")).toContainText("In the PDF the name prints as “Dr Lao”");
  // Greek prints as typed: no preview of a changed name
  const name = "Ελένη Παπαδοπούλου";
  await page.getByTestId("signer").fill(name);
  await expect(page.getByTestId("signer-pdf-form")).toHaveCount(0);
  await report.sign(name);
  await expect(page.getByTestId("signed-by")).toContainText(`Signed by ${name}`);
  const pdf = await page.request.get(`/api/tests/${testId}/report/pdf`);
  expect(pdf.status()).toBe(200);
  const text = pdfText(await pdf.body());
  expect(text).toContain(`Signed by ${name} (name as typed, not verified)`);
  expect(text).toContain(`Signed by ${name} on `);
});

/** A threshold as the change list writes it ("not determinable" has no unit). */
const withMlMin = (v: string) => (/^\d+$/.test(v) ? `${v} mL/min` : v);

test("report: after a threshold override the reviewer's edited text is carried into the new draft with a re-check note", async ({
  page,
}) => {
  const report = new ReportPage(page);
  const testId = await report.openDemoReportByLabel(/suspected pulmonary vascular/);
  const mine = "Reviewer's own conclusion written for the first analysis (e2e).";
  await report.section("conclusion").fill(mine);
  await report.saveDraft();
  await expect(page.getByTestId("draft-saved")).toBeVisible();
  const vt1Before = (
    await page.getByTestId("report-thresholds").locator("tr", { hasText: "VT1 (AT)" }).locator("td").nth(1).innerText()
  ).trim();

  // Reviewer override of VT1 on the analysis page: a new analysis version.
  await page.goto(`/tests/${testId}`);
  const card = page.getByTestId("threshold-vt1");
  await card.getByText("set VT1 by hand").click();
  // a VT1 the test can have: 30 mL/min above the automatic one (still below this demo's VT2; impossible values are refused)
  const vt1New = String(Math.round(Number(vt1Before.replace(/[^\d.]/g, ""))) + 30);
  await card.locator('[name="vo2MlMin"]').fill(vt1New);
  await card.locator('[name="by"]').fill("E2E Reviewer");
  await card.locator('[name="reason"]').fill("clear VE/VO2 rise with flat VE/VCO2 at this point");
  await card.getByRole("button", { name: "Save override" }).click();
  await expect(card).toContainText("Set by the reviewer (E2E Reviewer)");

  // The new draft keeps the reviewer's conclusion, says the numbers changed and which, and links the earlier version.
  await page.goto(`/tests/${testId}/report`);
  await report.ready();
  await expect(report.section("conclusion")).toHaveValue(mine);
  await expect(page.getByTestId("recheck-banner")).toContainText("Conclusion");
  const note = page.getByTestId("recheck-conclusion");
  await expect(note).toContainText("numbers changed");
  await expect(page.getByTestId("recheck-changes-conclusion")).toContainText(
    `VT1 (AT): ${withMlMin(vt1Before)} → ${vt1New} mL/min`,
  );
  await expect(note.getByRole("link", { name: /PDF of report version 1/ })).toBeVisible();
  await page.screenshot({ path: "reports/screenshots/report-carried-forward.png", fullPage: true });

  // The reviewer's threshold reads once who set it and why, with no detection confidence.
  const vt1Row = page.getByTestId("report-thresholds").locator("tr", { hasText: "VT1 (AT)" });
  await expect(vt1Row).toContainText("set by the reviewer (E2E Reviewer): clear VE/VO2 rise with flat VE/VCO2 at this point");
  expect((await vt1Row.innerText()).split("clear VE/VO2 rise").length - 1).toBe(1);
  await expect(vt1Row).not.toContainText("confidence");

  // Not signable until the section is confirmed as re-checked; the refusal keeps the name and the ticked box.
  await report.sign("Dr E2E Reviewer");
  await expect(page.getByTestId("sign-error")).toContainText("“Conclusion”");
  await expect(page.getByTestId("draft-mark")).toBeVisible();
  await expect(page.getByTestId("signer")).toHaveValue("Dr E2E Reviewer");
  await expect(page.getByTestId("attest")).toBeChecked();
  await page.getByTestId("rechecked-conclusion").check();
  await page.getByTestId("sign-submit").click();
  await expect(page.getByTestId("signed-by")).toContainText("Signed by Dr E2E Reviewer");
  await expect(page.getByTestId("signed-text")).toContainText(mine);

  // Removing the override after signing: a new draft again carries the signed text, with the note.
  await page.goto(`/tests/${testId}`);
  const remove = page.getByTestId("remove-override-vt1");
  await remove.locator('[name="reason"]').fill("automatic estimate preferred after review");
  await remove.locator('[name="by"]').fill("Dr E2E Reviewer");
  await remove.getByRole("button", { name: "Remove override" }).click();
  await expect(page.getByTestId("threshold-vt1")).not.toContainText("Set by the reviewer");
  await page.goto(`/tests/${testId}/report`);
  await report.ready();
  await expect(page.getByTestId("draft-mark")).toBeVisible();
  await expect(report.section("conclusion")).toHaveValue(mine);
  await expect(page.getByTestId("recheck-conclusion")).toContainText("version 2 (signed)");
  await expect(page.getByTestId("recheck-changes-conclusion")).toContainText(
    `VT1 (AT): ${vt1New} mL/min → ${withMlMin(vt1Before)}`,
  );
});

test("report: unsaved text survives Back and Forward and is restored with a notice; saving clears it", async ({ page }) => {
  const report = new ReportPage(page);
  const testId = await report.openDemoReportByLabel(/deconditioning after illness/);
  const typed = "Unsaved text typed before going Back (e2e).";
  await report.section("conclusion").fill(typed);
  await expect(page.getByTestId("draft-unsaved")).toBeVisible();
  // Leave by an in-app link (it asks; accept), then Back and Forward, which cannot ask.
  page.on("dialog", (d) => void d.accept());
  await page.getByRole("link", { name: "Back to the test" }).click();
  await page.waitForURL(new RegExp(`/tests/${testId}$`));
  await page.goBack();
  await page.waitForURL(/\/report$/);
  await expect(report.section("conclusion")).toHaveValue(typed);
  await expect(page.getByTestId("restored-notice")).toContainText(
    "Unsaved text from your last visit was restored — save or discard it",
  );
  await page.goForward();
  await page.waitForURL(new RegExp(`/tests/${testId}$`));
  await page.goBack();
  await page.waitForURL(/\/report$/);
  await expect(report.section("conclusion")).toHaveValue(typed);
  // Saving keeps the text and clears the kept copy: after a reload there is nothing to restore.
  await report.saveDraft();
  await expect(page.getByTestId("draft-saved")).toBeVisible();
  await expect(page.getByTestId("restored-notice")).toHaveCount(0);
  await page.reload();
  await report.ready();
  await expect(report.section("conclusion")).toHaveValue(typed);
  await expect(page.getByTestId("restored-notice")).toHaveCount(0);
  expect(await page.evaluate(() => Object.keys(sessionStorage).filter((k) => k.startsWith("cpet-desk:unsaved")))).toEqual([]);
});

test("report: two tabs revising one signed report — the second is refused with its text kept; an amended version says so", async ({
  browser,
}) => {
  const context = await browser.newContext();
  const a = await context.newPage();
  const b = await context.newPage();
  const tabA = new ReportPage(a);
  const testId = await tabA.openDemoReportByLabel(/pre-operative assessment/);
  await tabA.sign("Dr E2E First");
  await expect(a.getByTestId("signed-by")).toContainText("Signed by Dr E2E First");
  // both tabs now show the signed version 1
  await a.reload();
  await b.goto(`/tests/${testId}/report`);
  const tabB = new ReportPage(b);
  await tabA.ready();
  await tabB.ready();
  for (const p of [a, b]) await p.getByText("Revise the text (creates a new draft version)").click();
  // tab A revises first: a new draft version
  await tabA.section("conclusion").fill("Revision typed in tab A (e2e).");
  await tabA.saveDraft();
  await expect(a.getByTestId("draft-mark")).toContainText("DRAFT");
  // the editor re-mounts for the new version; the confirmation reaches it, with the keyboard focus
  await expect(a.getByTestId("new-version-notice")).toContainText(/as draft version \d+\. The signed version it revises stays/);
  await expect(a.getByTestId("new-version-notice")).toBeFocused();
  // tab B, still on the signed version, is refused; its text stays on screen
  await tabB.section("conclusion").fill("Revision typed in tab B (e2e).");
  await tabB.saveDraft();
  await expect(b.getByTestId("draft-error")).toContainText("a newer version of this report was made after this page was opened");
  await expect(tabB.section("conclusion")).toHaveValue("Revision typed in tab B (e2e).");
  // the draft says what signing it would change: only the text here, as no value moved
  await expect(a.getByTestId("amendment-panel")).toContainText(/Revises signed version \d+ \(not signed yet\)/);
  await expect(a.getByTestId("amendment-changes")).toContainText("No key value, threshold or scheme result differs");
  // an amendment is not signed without its reason; the name and the text stay
  await tabA.sign("Dr E2E Second", true, "");
  await expect(a.getByTestId("sign-error")).toContainText("Give the reason for the amendment");
  await expect(a.getByTestId("signer")).toHaveValue("Dr E2E Second");
  // tab A signs its own revision with a reason; the first signed version now says on its PDF that it was amended
  await a.getByTestId("amendment-reason").fill("Conclusion reworded after the team's review (e2e).");
  await a.getByTestId("sign-submit").click();
  await expect(a.getByTestId("signed-text")).toContainText("Revision typed in tab A (e2e).");
  await expect(a.getByTestId("amendment-reason-shown")).toContainText(
    "Reason: Conclusion reworded after the team's review (e2e).",
  );
  await expect(a.getByTestId("version-note")).toContainText(/Revises version \d+, signed by Dr E2E First/);
  await expect(a.getByTestId("signer-identity")).toContainText("not verified");
  // the list of versions says which is current and which the new signature amends
  await expect(a.getByTestId("report-versions")).toContainText(/signed by Dr E2E Second on .+ \(current\)/);
  await expect(a.getByTestId("report-versions")).toContainText(/signed by Dr E2E First on .+ \(amended by version \d+\)/);
  await context.close();
});
