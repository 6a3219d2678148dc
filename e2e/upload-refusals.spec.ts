import { expect, test, type Page } from "@playwright/test";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { plainRampCsv } from "./fixtures/plain-ramp.csv";

/**
 * Refused uploads keep every field (text, number and select), an oversize file is refused in the browser before it is
 * sent, an empty file is called empty, and time-averaged rows are not called breaths. All files and patient details are
 * INVENTED; the large and empty files are written to a temporary folder at test time.
 */

/** INVENTED patient and test details, as a clinician would fill them in (a treadmill test for heart failure). */
const DETAILS = {
  label: "E2E refused upload",
  sex: "female",
  ageY: "58",
  heightCm: "162",
  weightKg: "70",
  ergometer: "treadmill",
  referral: "heart-failure",
  fev1L: "2.4",
  mvvLMin: "95",
};

let dir = "";
test.beforeAll(() => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), "cpet-e2e-upload-"));
});
test.afterAll(() => {
  fs.rmSync(dir, { recursive: true, force: true });
});

async function fillDetails(page: Page, details: Record<string, string>) {
  const form = page.getByTestId("upload-form");
  for (const [name, value] of Object.entries(details)) {
    const field = form.locator(`[name="${name}"]`);
    if ((await field.evaluate((el) => el.tagName)) === "SELECT") await field.selectOption(value);
    else await field.fill(value);
  }
}

/** Every field shows what was entered. */
async function expectDetailsKept(page: Page, details: Record<string, string>) {
  const form = page.getByTestId("upload-form");
  for (const [name, value] of Object.entries(details)) await expect(form.locator(`[name="${name}"]`)).toHaveValue(value);
}

/** Submits the form and waits for the server's answer to be drawn (the button is ready again). */
async function submitAndWait(page: Page) {
  const answered = page.waitForResponse((r) => r.request().method() === "POST");
  await page.getByTestId("upload-submit").click();
  await answered;
  await expect(page.getByTestId("upload-submit")).toHaveText("Import and analyse");
  await expect(page.getByTestId("upload-form")).not.toHaveAttribute("aria-busy", "true");
}

/** Records the server-action posts the page sends. */
function countPosts(page: Page): () => number {
  let posts = 0;
  page.on("request", (r) => {
    if (r.method() === "POST") posts++;
  });
  return () => posts;
}

test("a 21 MB file is refused in the browser with its size and the limit, and every field is kept", async ({ page }) => {
  // 21 × 1048576 = 22020096 bytes of INVENTED rows
  const huge = path.join(dir, "huge.csv");
  const row = "600,2500.0,2375.0,69.50,170,200\n";
  const fd = fs.openSync(huge, "w");
  fs.writeSync(fd, "time_s,vo2_ml_min,vco2_ml_min,ve_l_min,hr_bpm,work_w\n");
  fs.writeSync(fd, row.repeat(Math.ceil(22_020_096 / row.length)));
  fs.ftruncateSync(fd, 22_020_096);
  fs.closeSync(fd);

  await page.goto("/");
  const posts = countPosts(page);
  await fillDetails(page, DETAILS);
  await page.getByTestId("upload-file").setInputFiles(huge);
  // said at once, when the file is chosen
  const error = page.getByTestId("upload-file-error");
  await expect(error).toContainText("The chosen file huge.csv is 21.0 MB, larger than the 20 MB limit");
  await page.getByTestId("upload-submit").click();
  await expect(error).toContainText("huge.csv is 21.0 MB, larger than the 20 MB limit");
  await expect(page).toHaveURL(/\/$/);
  await expect(page.getByText("This page couldn't load")).toHaveCount(0);
  await expectDetailsKept(page, DETAILS);
  expect(posts()).toBe(0);
  await expect(page.getByTestId("clinical-caution")).toBeVisible();

  // choosing a usable file clears the message and the upload goes through with the details as chosen
  await page.getByTestId("upload-file").setInputFiles({
    name: "plain-ramp.csv",
    mimeType: "text/csv",
    buffer: Buffer.from(plainRampCsv()),
  });
  await expect(error).toHaveCount(0);
  await page.getByTestId("upload-submit").click();
  await page.waitForURL(/\/tests\/\d+$/);
  await expect(page.getByTestId("test-title")).toHaveText("E2E refused upload");
  await expect(page.locator("p.how").first()).toContainText("female, 58 y, 162 cm, 70 kg · treadmill · referral: heart-failure");
});

test("an empty file is called empty (0 bytes), not missing, and every field is kept", async ({ page }) => {
  const empty = path.join(dir, "empty.csv");
  fs.writeFileSync(empty, "");
  await page.goto("/");
  await fillDetails(page, DETAILS);
  await page.getByTestId("upload-file").setInputFiles(empty);
  await page.getByTestId("upload-submit").click();
  const error = page.getByTestId("upload-file-error");
  await expect(error).toContainText("The chosen file empty.csv is empty (0 bytes)");
  await expect(error).not.toContainText("Choose a breath-by-breath");
  await expectDetailsKept(page, DETAILS);
});

test("without JavaScript the server refuses an empty file in the same words and keeps the selects", async ({ browser }) => {
  const context = await browser.newContext({ javaScriptEnabled: false });
  const page = await context.newPage();
  const empty = path.join(dir, "empty-nojs.csv");
  fs.writeFileSync(empty, "");
  await page.goto("/");
  await fillDetails(page, DETAILS);
  await page.getByTestId("upload-file").setInputFiles(empty);
  await page.getByTestId("upload-submit").click();
  await expect(page.getByTestId("upload-file-error")).toContainText("The chosen file empty-nojs.csv is empty (0 bytes)");
  await expectDetailsKept(page, DETAILS);
  await context.close();
});

test("details refused by the server keep the selects; the corrected upload is analysed as a treadmill test", async ({ page }) => {
  await page.goto("/");
  // no file chosen: the server asks for one and every field is kept
  await fillDetails(page, DETAILS);
  await submitAndWait(page);
  await expect(page.getByTestId("upload-file-error")).toHaveText("Choose a breath-by-breath or stage file to upload.");
  await expectDetailsKept(page, DETAILS);

  await fillDetails(page, { ...DETAILS, ageY: "400" });
  await page.getByTestId("upload-file").setInputFiles({
    name: "plain-ramp.csv",
    mimeType: "text/csv",
    buffer: Buffer.from(plainRampCsv()),
  });
  await submitAndWait(page);
  await expect(page.getByText("Age (years) must be at most 110")).toBeVisible();
  await expect(page.getByTestId("upload-kept")).toContainText("plain-ramp.csv");
  await expectDetailsKept(page, { ...DETAILS, ageY: "400" });

  // a second refusal after changing a select: the new choice is kept, not the first one
  await page.locator('[name="referral"]').selectOption("pre-operative");
  await submitAndWait(page);
  await expect(page.getByText("Age (years) must be at most 110")).toBeVisible();
  await expectDetailsKept(page, { ...DETAILS, ageY: "400", referral: "pre-operative" });

  await page.locator('[name="ageY"]').fill("58");
  await page.getByTestId("upload-submit").click();
  await page.waitForURL(/\/tests\/\d+$/);
  await expect(page.locator("p.how").first()).toContainText("female, 58 y, 162 cm, 70 kg · treadmill · referral: pre-operative");
  await expect(page.getByTestId("row-count")).toHaveText("221 breaths");
  await expect(page.getByTestId("clinical-caution")).toContainText("qualified clinician");
});

test("10-s time averages are counted as rows, not breaths", async ({ page }) => {
  // INVENTED: the plain ramp of e2e/fixtures (VO2 500 → 2500 mL/min over 600 s, then 60 s at 2500) as one row every
  // 10 s, the way a cart exports 10-s time averages: 0, 10, … 660 s = 67 rows
  const lines = ["time_s,vo2_ml_min,vco2_ml_min,ve_l_min,hr_bpm,work_w,phase"];
  for (let t = 0; t <= 660; t += 10) {
    const vo2 = t <= 600 ? 500 + (2000 * t) / 600 : 2500;
    const ve = (vo2 * 0.95 * 28) / 1000 + 3;
    lines.push(
      `${t},${vo2.toFixed(1)},${(vo2 * 0.95).toFixed(1)},${ve.toFixed(2)},${Math.round(70 + vo2 / 25)},${(Math.min(t, 600) / 3).toFixed(0)},exercise`,
    );
  }
  const tenSecond = lines.join("\n") + "\n";
  await page.goto("/");
  await fillDetails(page, { label: "E2E 10-s averages", sex: "male", ageY: "50", heightCm: "175", weightKg: "80" });
  await page
    .getByTestId("upload-file")
    .setInputFiles({ name: "avg10s.csv", mimeType: "text/csv", buffer: Buffer.from(tenSecond) });
  await page.getByTestId("upload-submit").click();
  await page.waitForURL(/\/tests\/\d+$/);
  await expect(page.getByTestId("row-count")).toHaveText("67 rows, about 10-s time averages");
  await expect(page.locator("p.how").first()).not.toContainText("breaths");
  await expect(page.getByTestId("clinical-caution")).toContainText("qualified clinician");
});

test("a form sent from another site's page is refused plainly (403), and a foreign Host name is misdirected (421)", async ({
  request,
}) => {
  // INVENTED host names; the server-action origin check had answered such a post with 500
  const forged = await request.post("/", {
    headers: { origin: "http://forms.invalid", "content-type": "application/x-www-form-urlencoded" },
    data: "label=forged",
  });
  expect(forged.status()).toBe(403);
  expect(await forged.text()).toContain("sent from another site's page");
  const rebound = await request.get("/", { headers: { host: "rebound.invalid" } });
  expect(rebound.status()).toBe(421);
  // the same post from this site's own origin is not refused by the guard
  const own = await request.post("/", {
    headers: {
      origin: new URL("/", test.info().project.use.baseURL).origin,
      "content-type": "application/x-www-form-urlencoded",
    },
    data: "label=own",
  });
  expect(own.status()).not.toBe(403);
});

test("a file holding two people is refused with the choice to make first, and the chosen test is named on its page", async ({
  page,
}) => {
  // INVENTED: the plain ramp written twice under an ID column (7 and 8), the second with VO2 × 0.8
  const [header, ...rows] = plainRampCsv().trim().split("\n");
  const scaled = rows.map((r) => {
    const c = r.split(",");
    c[1] = (Number(c[1]) * 0.8).toFixed(1);
    return c.join(",");
  });
  const csv = [`ID,${header}`, ...rows.map((r) => `7,${r}`), ...scaled.map((r) => `8,${r}`)].join("\n") + "\n";
  await page.goto("/");
  await page.getByTestId("upload-file").setInputFiles({ name: "two-people.csv", mimeType: "text/csv", buffer: Buffer.from(csv) });
  await page.getByTestId("upload-submit").click();
  await page.waitForURL(/\/tests\/\d+/);
  await expect(page.getByTestId("refused")).toContainText("holds 2 tests");
  await page.goto(`${new URL(page.url()).pathname}/columns`);
  await expect(page.getByTestId("refused-what-next")).toHaveText(
    "This file holds several tests. Choose the one to import (the test's identifier below), then re-read it.",
  );
  await page.getByTestId("record-select").selectOption("8");
  await page.getByRole("button", { name: "Re-read the file with these choices" }).click();
  await expect(page.getByTestId("import-status")).toHaveText("imported");
  await page.goto(new URL(page.url()).pathname.replace(/\/columns$/, ""));
  await expect(page.getByTestId("selected-record")).toHaveText(", the test where ID = 8");
  // by construction the second person's VO2 holds at 2500 × 0.8 = 2000 mL/min
  await expect(page.getByTestId("row-peakVo2")).toContainText("2000");
});
