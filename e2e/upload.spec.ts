import { expect, test } from "@playwright/test";
import fs from "node:fs";
import path from "node:path";
import { plainRampCsv } from "./fixtures/plain-ramp.csv";
import { RegisterPage } from "./pages/RegisterPage";

test("upload a plain-convention CSV and see duration and peak VO2 with the caution", async ({ page }) => {
  const register = new RegisterPage(page);
  await register.open();
  await expect(page.getByTestId("clinical-caution")).toBeVisible();
  await register.upload(
    { name: "plain-ramp.csv", content: plainRampCsv() },
    { label: "E2E plain ramp", weightKg: "80", sex: "male", ageY: "50", heightCm: "175" },
  );
  await page.waitForURL(/\/tests\/\d+/);
  // Known by construction: highest 30-s average = 2500 mL/min; 2500 / 80 kg = 31.25 mL/kg/min.
  await expect(page.getByTestId("row-peakVo2")).toContainText("2500");
  await expect(page.getByTestId("row-peakVo2PerKg")).toContainText("31.3");
  await expect(page.getByTestId("peak-summary")).toContainText("highest 30-s rolling average");
  await expect(page.getByTestId("peak-summary")).toContainText("Test duration 11:00");
  await expect(page.getByTestId("clinical-caution")).toContainText("qualified clinician");
  await page.screenshot({ path: "reports/screenshots/upload-result.png", fullPage: true });
});

test("a file that cannot be used is refused with what to fix, and the original is kept", async ({ page }) => {
  const register = new RegisterPage(page);
  await register.open();
  await register.upload({ name: "not-a-test.csv", content: "hello,world\n1,2\n" }, { label: "E2E broken" });
  await page.waitForURL(/\/tests\/\d+/);
  await expect(page.getByTestId("refused")).toBeVisible();
  await expect(page.getByTestId("refused")).toContainText(/time/i);
  const download = page.getByRole("link", { name: /original file/ });
  await expect(download).toBeVisible();
  const href = await download.getAttribute("href");
  const res = await page.request.get(href!);
  expect(await res.text()).toBe("hello,world\n1,2\n");
});

test("invalid details keep the uploaded file and explain the problem", async ({ page }) => {
  const register = new RegisterPage(page);
  await register.open();
  await register.upload({ name: "plain-ramp.csv", content: plainRampCsv() }, { label: "E2E bad age", ageY: "400" });
  await expect(page.getByTestId("upload-kept")).toContainText("plain-ramp.csv");
  await expect(page.getByText("Age (years) must be at most 110")).toBeVisible();
  await page.locator('[name="ageY"]').fill("50");
  await page.getByTestId("upload-submit").click();
  await page.waitForURL(/\/tests\/\d+/);
  await expect(page.getByTestId("row-peakVo2")).toContainText("2500");
});

test("breaths exported smoothed: oscillatory ventilation is reported with a warning to check the VE trace", async ({ page }) => {
  // The INVENTED heart-failure demo (tests/fixtures/cases) as a cart would export it with a 3-breath trailing mean.
  const csv = fs.readFileSync(path.resolve(__dirname, "../tests/fixtures/cases/heart-failure.csv"), "utf8");
  const lines = csv.trim().split("\n");
  const headerAt = lines.findIndex((l) => !l.startsWith("#"));
  const header = lines[headerAt].split(",");
  const cols = ["vo2_ml_min", "vco2_ml_min", "ve_l_min", "rr_br_min", "vt_l", "peto2_mmhg", "petco2_mmhg"].map((c) =>
    header.indexOf(c),
  );
  const rows = lines.slice(headerAt + 1).map((l) => l.split(","));
  const smoothed = rows.map((r, i) =>
    r.map((cell, j) => (i < 2 || !cols.includes(j) ? cell : ((+rows[i][j] + +rows[i - 1][j] + +rows[i - 2][j]) / 3).toFixed(3))),
  );
  const register = new RegisterPage(page);
  await register.open();
  await register.upload(
    {
      name: "hf-smoothed.csv",
      content: [...lines.slice(0, headerAt + 1), ...smoothed.map((r) => r.join(","))].join("\n") + "\n",
    },
    { label: "E2E smoothed breaths", weightKg: "78", sex: "male", ageY: "62", heightCm: "174" },
  );
  await page.waitForURL(/\/tests\/\d+/);
  await expect(page.getByTestId("eov-carry-over").first()).toContainText("breath noise carries over");
  await expect(page.getByTestId("eov-carry-over").first()).toContainText("check the VE trace");
  await expect(page.getByText(/Breath VE noise carries over from one breath to the next/).first()).toBeVisible();
  await expect(page.getByTestId("clinical-caution")).toContainText("qualified clinician");
});

test("ischaemic heart disease asked with a pre-operative upload settles the three-tier category", async ({ page }) => {
  // The INVENTED normal-adult demo (tests/fixtures/cases) sent as a pre-operative referral: AT ≥ 11 mL/kg/min and
  // VE/VCO2 at AT ≤ 34, so ischaemic heart disease alone decides low or intermediate risk in the three-tier scheme.
  const csv = fs.readFileSync(path.resolve(__dirname, "../tests/fixtures/cases/normal-adult.csv"), "utf8");
  const details = { weightKg: "75", sex: "male", ageY: "45", heightCm: "178", referral: "pre-operative" };
  const register = new RegisterPage(page);
  await register.open();
  await register.upload({ name: "normal-preop.csv", content: csv }, { ...details, label: "E2E pre-op, IHD not stated" });
  await page.waitForURL(/\/tests\/\d+/);
  await expect(page.getByTestId("schemes")).toContainText(
    "depends on ischaemic heart disease (not recorded): low risk (AT ≥ 11 mL/kg/min, no other risk factor) if absent",
  );
  await expect(page.getByTestId("clinical-caution")).toContainText("qualified clinician");

  await register.open();
  await register.upload(
    { name: "normal-preop.csv", content: csv },
    { ...details, ischaemicHeartDisease: "yes", label: "E2E pre-op, IHD yes" },
  );
  await page.waitForURL(/\/tests\/\d+/);
  const schemes = page.getByTestId("schemes");
  await expect(schemes).toContainText(
    "Intermediate risk (one of AT 8-10.9 mL/kg/min, VE/VCO2 at AT > 34, ischaemic heart disease)",
  );
  await expect(schemes).not.toContainText("depends on ischaemic heart disease");
  // the answer is the clinical context's, where it can be changed later
  await page.goto(`${new URL(page.url()).pathname}/inputs`);
  await expect(page.getByTestId("context-form").locator('[name="ischaemicHeartDisease"]')).toHaveValue("yes");
});
