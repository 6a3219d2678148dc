import { expect, test } from "@playwright/test";
import { ColumnReviewPage, testIdFromUrl } from "./pages/ImportPages";
import { RegisterPage } from "./pages/RegisterPage";

/**
 * INVENTED 12-min breath file whose headers the importer does not know (foo = time in s, bar = VO2 in
 * mL/min, baz = HR): VO2 400 → 2600 mL/min and HR 70 → 166 over 720 s, one row every 5 s.
 */
function unknownColumnsCsv(): string {
  const lines = ["foo,bar,baz"];
  for (let t = 0; t <= 720; t += 5) lines.push(`${t},${(400 + (2200 * t) / 720).toFixed(0)},${Math.round(70 + (96 * t) / 720)}`);
  return lines.join("\n") + "\n";
}

test("details entered with a refused file are kept and used once its columns are mapped by hand", async ({ page }) => {
  const register = new RegisterPage(page);
  await register.open();
  await register.upload(
    { name: "unknown-columns.csv", content: unknownColumnsCsv() },
    { label: "E2E kept details", sex: "female", ageY: "52", heightCm: "165", weightKg: "65", ergometer: "treadmill" },
  );
  await page.waitForURL(/\/tests\/\d+/);
  const id = testIdFromUrl(page);
  await expect(page.getByTestId("refused")).toBeVisible();

  const columns = new ColumnReviewPage(page);
  await columns.open(id);
  // the details typed at upload are shown, ready to check
  await expect(page.getByTestId("refused-sex")).toHaveValue("female");
  await expect(page.getByTestId("refused-age")).toHaveValue("52");
  await expect(page.getByTestId("refused-height")).toHaveValue("165");
  await expect(page.getByTestId("weight")).toHaveValue("65");
  await expect(page.getByTestId("column-form").locator('[name="ergometer"]')).toHaveValue("treadmill");
  await columns.setField("foo", "Time");
  await columns.setField("bar", "VO2");
  await columns.setField("baz", "Heart rate");
  await columns.reread();
  await expect(page.getByTestId("columns-ok")).toContainText("The file is now usable: 145 rows were read");
  // the reason beside the "set by user" tag does not say it again
  await expect(page.getByTestId("reason").first()).toContainText("set by user");
  for (const text of await page.getByTestId("reason").allInnerTexts()) expect(text).not.toMatch(/set by user\s+set by user/);

  await page.goto(`/tests/${id}`);
  await expect(page.getByTestId("test-title")).toHaveText("E2E kept details");
  await expect(page.getByText("female, 52 y, 165 cm, 65 kg · treadmill")).toBeVisible();
  await expect(page.getByTestId("clinical-caution")).toContainText("qualified clinician");
});

test("a 3-row file with VO2 8000 mL/min is read with warnings naming the column and the limit", async ({ page }) => {
  const register = new RegisterPage(page);
  await register.open();
  await register.upload(
    { name: "three-rows.csv", content: "foo,bar,baz\n0,7900,120\n60,8000,140\n120,7950,160\n" },
    { label: "E2E three rows", weightKg: "75" },
  );
  await page.waitForURL(/\/tests\/\d+/);
  const id = testIdFromUrl(page);
  const columns = new ColumnReviewPage(page);
  await columns.open(id);
  await columns.setField("foo", "Time");
  await columns.setField("bar", "VO2");
  await columns.setField("baz", "Heart rate");
  await columns.reread();
  await expect(page.getByTestId("columns-ok")).toContainText("3 rows were read");
  await expect(page.getByTestId("columns-ok")).toContainText("warning(s) about the data");
  const issues = page.getByTestId("import-issues");
  // 8000 > 7000 mL/min and 8000 / 75 kg = 106.7 > 90 mL/kg/min (physiological plausibility, common practice)
  await expect(issues).toContainText('VO2 in "bar": 3 value(s) above 7000 mL/min (highest 8000)');
  await expect(issues).toContainText("above 90 mL/kg/min (highest 107)");
  // 3 stages 60 s apart cover 3 min, less than the 8–12 min incremental phase (ERS 2019)
  await expect(issues).toContainText("The recording covers 3 min (3 stage(s))");

  await page.goto(`/tests/${id}`);
  await expect(page.getByText(/beyond physiological plausibility/).first()).toBeVisible();
});

test("patient details are corrected on their own page: limits enforced, typed values kept, a new analysis version made", async ({
  page,
}) => {
  const register = new RegisterPage(page);
  await register.open();
  const ramp = ["time_s,vo2_ml_min,vco2_ml_min,ve_l_min,hr_bpm,work_w"];
  for (let t = 0; t <= 660; t += 3) {
    const vo2 = t <= 600 ? 500 + (2000 * t) / 600 : 2500;
    ramp.push(
      `${t},${vo2.toFixed(1)},${(vo2 * 0.95).toFixed(1)},${((vo2 * 0.95 * 28) / 1000 + 3).toFixed(2)},${Math.round(70 + vo2 / 25)},${(Math.min(t, 600) / 3).toFixed(0)}`,
    );
  }
  await register.upload(
    { name: "ramp.csv", content: ramp.join("\n") + "\n" },
    { label: "E2E patient edit", sex: "male", ageY: "50", heightCm: "175", weightKg: "80" },
  );
  await page.waitForURL(/\/tests\/\d+/);
  const id = testIdFromUrl(page);
  await page.goto(`/tests/${id}/columns`);
  await page.getByTestId("patient-link").click();
  await expect(page.getByTestId("patient-title")).toContainText("E2E patient edit");
  await expect(page.getByTestId("patient-ageY")).toHaveValue("50");

  // out of the shared limits (PLAUSIBLE_LIMITS: age 5–110): refused, and what was typed stays
  await page.getByTestId("patient-ageY").fill("400");
  await page.getByTestId("patient-heightCm").fill("181");
  await page.getByTestId("patient-save").click();
  await expect(page.getByTestId("patient-error-ageY")).toHaveText("Age (years) must be at most 110");
  await expect(page.getByTestId("patient-ageY")).toHaveValue("400");
  await expect(page.getByTestId("patient-heightCm")).toHaveValue("181");
  // a reload after the refusal keeps what was typed, says so, and offers to drop it
  await page.reload();
  await expect(page.getByTestId("patient-restored")).toContainText("were not saved and have been put back");
  await expect(page.getByTestId("patient-ageY")).toHaveValue("400");
  await expect(page.getByTestId("patient-heightCm")).toHaveValue("181");
  await page.getByTestId("patient-restored").getByRole("button", { name: "Discard them" }).click();
  await expect(page.getByTestId("patient-ageY")).toHaveValue("50");
  await page.getByTestId("patient-heightCm").fill("181");

  await page.getByTestId("patient-ageY").fill("51");
  await page.getByTestId("patient-weightKg").fill("100");
  await page.getByTestId("patient-save").click();
  await expect(page.getByTestId("patient-ok")).toContainText("age 50 y → 51 y; height 175 cm → 181 cm; weight 80 kg → 100 kg");
  await expect(page.getByTestId("patient-ok")).toContainText("Analysis version 1 was created");

  await page.goto(`/tests/${id}`);
  await expect(page.getByText("male, 51 y, 181 cm, 100 kg")).toBeVisible();
  await expect(page.getByText(/analysis version 1/)).toBeVisible();
  // same breaths: peak VO2 2500 mL/min (by construction); per kg now 2500 / 100 = 25.0
  await expect(page.getByTestId("row-peakVo2")).toContainText("2500");
  await expect(page.getByTestId("row-peakVo2PerKg")).toContainText("25");
});

test("a file that is no table is refused without an offer to map columns, saying what to do instead", async ({ page }) => {
  const register = new RegisterPage(page);
  await register.open();
  // INVENTED bytes that are neither text nor a workbook
  await register.upload({ name: "not-a-table.csv", content: Buffer.from([0, 1, 2, 255, 254, 0, 7, 8, 9, 0, 0, 13]) });
  await page.waitForURL(/\/tests\/\d+/);
  const id = testIdFromUrl(page);
  const refused = page.getByTestId("refused");
  await expect(refused).toBeVisible();
  await expect(refused.getByTestId("columns-link")).toHaveCount(0);
  await expect(refused.getByTestId("not-a-table")).toContainText("no columns to map");
  await expect(refused.getByTestId("not-a-table")).toContainText("as a CSV or XLSX file");
  // the issue is given as its message; its code stays out of the visible text
  await expect(refused.locator("li[data-code]")).not.toHaveCount(0);
  expect(await refused.innerText()).not.toMatch(/\[[a-z0-9]+(-[a-z0-9]+)+\]/);

  await page.goto(`/tests/${id}/columns`);
  await expect(page.getByText("cannot be read as a table at all")).toBeVisible();
  await expect(page.getByTestId("import-issues").locator("th")).toHaveText(["Severity", "Problem", "Row", "Column"]);
});

test("a refused file whose columns are only unknown keeps the offer to map them by hand", async ({ page }) => {
  const register = new RegisterPage(page);
  await register.open();
  await register.upload({ name: "unknown-names.csv", content: unknownColumnsCsv() });
  await page.waitForURL(/\/tests\/\d+/);
  await expect(page.getByTestId("refused").getByTestId("columns-link")).toBeVisible();
  await expect(page.getByTestId("not-a-table")).toHaveCount(0);
});

test("an anonymised teaching copy reads the same numbers without the file, and the original stays", async ({ page }) => {
  await page.goto("/");
  const demo = page.getByRole("link", { name: /heart failure assessment/ }).first();
  const href = await demo.getAttribute("href");
  const originalId = Number(/\/tests\/(\d+)/.exec(href ?? "")![1]);
  await page.goto(`/tests/${originalId}`);
  const peak = await page.getByTestId("row-peakVo2PerKg").locator("td").nth(1).innerText();
  await page.goto(`/tests/${originalId}/patient`);
  // a label is needed; what is typed stays after the refusal
  await page.getByTestId("copy-submit").click();
  await expect(page.getByTestId("copy-error")).toContainText("Give the copy a label");
  await page.getByTestId("copy-label").fill("Teaching case E2E: breathless on exertion");
  await page.getByTestId("copy-submit").click();
  await page.waitForURL((url) => /\/tests\/\d+$/.test(url.pathname) && !url.pathname.endsWith(`/${originalId}`));
  const copyId = Number(/\/tests\/(\d+)/.exec(page.url())![1]);
  await expect(page.getByTestId("test-title")).toHaveText("Teaching case E2E: breathless on exertion");
  await expect(page.getByText("no uploaded file kept")).toBeVisible();
  await expect(page.getByRole("link", { name: "original file" })).toHaveCount(0);
  await expect(page.getByTestId("row-peakVo2PerKg").locator("td").nth(1)).toHaveText(peak);
  // the register names no file for it; the original is still listed with its own
  await page.goto("/");
  const row = page.getByRole("row", { name: /Teaching case E2E/ });
  await expect(row).toContainText("none kept");
  await expect(page.getByRole("link", { name: /heart failure assessment/ }).first()).toHaveAttribute(
    "href",
    `/tests/${originalId}`,
  );
  await page.goto(`/tests/${copyId}/columns`);
  await expect(page.getByTestId("file-facts")).toContainText("(none kept)");
});
