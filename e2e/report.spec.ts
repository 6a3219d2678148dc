import fs from "node:fs";
import { expect, test, type Page } from "@playwright/test";

/** Page object for a test's report page (draft editing, signing, PDF). */
class ReportPage {
  constructor(private readonly page: Page) {}

  /** Open the invented demo case from the register and go to its report; returns the test id. */
  async openDemoReport(): Promise<number> {
    await this.page.goto("/");
    await this.page
      .getByRole("link", { name: /Demo \(invented\)/ })
      .first()
      .click();
    await this.page.waitForURL(/\/tests\/\d+$/);
    const id = Number(/\/tests\/(\d+)/.exec(this.page.url())![1]);
    await this.page.goto(`/tests/${id}/report`);
    return id;
  }

  section(id: string) {
    return this.page.getByTestId(`section-${id}`);
  }

  async saveDraft() {
    await this.page.getByTestId("draft-save").click();
  }

  async sign(name: string, attest = true) {
    await this.page.getByTestId("signer").fill(name);
    if (attest) await this.page.getByTestId("attest").check();
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
  await expect(report.section("pathway")).toHaveValue(text);

  // Too long: refused with a message, the typed text stays in the box, the saved text is unchanged.
  const tooLong = "x".repeat(4001);
  await report.section("conclusion").fill(tooLong);
  await report.saveDraft();
  await expect(page.getByTestId("section-error-conclusion")).toContainText("at most 4000 characters");
  await expect(report.section("conclusion")).toHaveValue(tooLong);
  await page.reload();
  await expect(report.section("conclusion")).toHaveValue(initialConclusion);

  // Signing needs the attestation.
  await report.sign("Dr E2E Reviewer", false);
  await expect(page.getByText("Confirm that you have reviewed the report")).toBeVisible();
  await report.sign("Dr E2E Reviewer");
  await expect(page.getByTestId("signed-by")).toContainText("Signed by Dr E2E Reviewer");
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
