import { expect, test } from "@playwright/test";
import fs from "node:fs";
import path from "node:path";

// The register seeds six INVENTED demo cases on first start (lib/store/demoCases.ts).
async function openDemo(page: import("@playwright/test").Page, label: RegExp) {
  await page.goto("/");
  await page.getByRole("link", { name: label }).click();
  await page.waitForURL(/\/tests\/\d+$/);
}

test("the analysis view shows thresholds, predicted values, interpretation and schemes with the caution", async ({ page }) => {
  await openDemo(page, /heart failure assessment/);
  await expect(page.getByTestId("clinical-caution")).toBeVisible();
  await expect(page.getByTestId("row-peakVo2")).toContainText("Hansen");
  await expect(page.getByTestId("threshold-vt1")).toContainText("mL/min");
  // the band beside each threshold says what it is: its calibration on invented recordings, not a promise
  await expect(page.getByTestId("band-meaning")).toContainText("about 8 of 10 invented recordings");
  // the slope indices carry their bands too, with the same words under their table
  await expect(page.getByTestId("indices")).toContainText(/VE\/VCO2 slope, whole exercise[\s\S]*band \d/);
  await expect(page.getByTestId("indices")).toContainText(/ΔVO2\/ΔWR on the ramp[\s\S]*band \d/);
  await expect(page.getByTestId("indices")).toContainText(/VE\/VCO2 slope, whole exercise[\s\S]*corrected for breath noise \d/);
  await expect(page.getByTestId("index-band-meaning")).toContainText("OUES and ΔVO2/ΔWR");
  // VE/VCO2 at VT1 with what it reads at the two ends of the VT1 band (lib/thresholds/valuesAtThreshold.ts)
  await expect(page.getByTestId("indices").getByRole("row", { name: /^VE\/VCO2 at VT1/ })).toContainText(
    /\d+\.\d[\s\S]*at the VT1 band's ends \d+\.\d and \d+\.\d/,
  );
  await expect(page.getByTestId("charts").locator("svg")).toHaveCount(5);
  await expect(page.getByTestId("interpretation-path")).toContainText("Peak VO2");
  await expect(page.getByTestId("schemes")).toContainText("Weber");
  // a class near a cut-off says where its measurement's band reaches (invented demo: slope 39.8, band up to 46.5)
  await expect(page.getByTestId("schemes")).toContainText("band 39.2–46.5 reaches Ventilatory class IV");
  await expect(page.getByTestId("patterns")).toContainText("consistent with");
  // a criterion that cannot be read says why: on this ramp a 5–10 % work increase raises VO2 by less than the plateau
  // cut-off at the late rise of VO2 with work rate, so the plateau cannot be told from a steady rise
  await expect(page.getByTestId("effort-criteria")).toContainText(
    "VO2 plateau not available (at the rise of VO2 with work rate late in this test",
  );
  // this demo's peak RER (1.06) lies within two standard errors of the 1.05 criterion: the verdict says it is borderline
  await expect(page.getByTestId("effort-borderline")).toContainText(/Near a cut-off: the peak RER \d\.\d\d–\d\.\d\d .* reaches /);
  await page.screenshot({ path: "reports/screenshots/analysis-heart-failure.png", fullPage: true });
});

test("a reviewer override of VT1 is saved as a new version and recomputes the dependent values", async ({ page }) => {
  await openDemo(page, /deconditioning/);
  const card = page.getByTestId("threshold-vt1");
  await card.getByText("set VT1 by hand").click();
  // the invented deconditioning demo: peak VO2 about 1825 mL/min, VT2 about 1420 mL/min, so 1250 is a possible VT1
  await card.locator('[name="vo2MlMin"]').fill("1250");
  await card.locator('[name="by"]').fill("E2E Reviewer");
  await card.locator('[name="reason"]').fill("clear VE/VO2 rise with flat VE/VCO2 at this point");
  await card.getByRole("button", { name: "Save override" }).click();
  await expect(card).toContainText("Set by the reviewer (E2E Reviewer)");
  await expect(card.locator(".keyfig")).toContainText("1250");
  await expect(page.getByTestId("versions")).toContainText("VT1 override");
  // Removing the override asks why and who, as setting it did, and returns to the automatic estimate.
  const remove = card.getByTestId("remove-override-vt1");
  await remove.getByRole("button", { name: "Remove override" }).click();
  await expect(card).toContainText("Set by the reviewer"); // refused in the browser: no reason, no name
  await remove.locator('[name="reason"]').fill("break not supported on second look");
  await remove.locator('[name="by"]').fill("E2E Reviewer");
  await remove.getByRole("button", { name: "Remove override" }).click();
  await expect(card).not.toContainText("Set by the reviewer");
  await expect(page.getByTestId("versions")).toContainText(
    "VT1 override removed (the automatic estimate is used again): break not supported on second look, by E2E Reviewer",
  );
});

test("an override the test cannot have (VT1 above peak VO2) is refused with the reason and nothing is saved", async ({
  page,
}) => {
  await openDemo(page, /deconditioning/);
  const card = page.getByTestId("threshold-vt1");
  await card.getByText("set VT1 by hand").click();
  await card.locator('[name="vo2MlMin"]').fill("3500");
  await card.locator('[name="by"]').fill("E2E Reviewer");
  await card.locator('[name="reason"]').fill("typed in the wrong box");
  await card.getByRole("button", { name: "Save override" }).click();
  await expect(card).toContainText("above this test's peak VO2");
  await expect(card).toContainText("must lie below VT2");
  await expect(card).not.toContainText("Set by the reviewer");
  await expect(card.locator('[name="vo2MlMin"]')).toHaveValue("3500");
  // a VO2 and a time together: one would be ignored, so the form asks for one of them
  await card.locator('[name="vo2MlMin"]').fill("1250");
  await card.locator('[name="time"]').fill("8:30");
  await card.getByRole("button", { name: "Save override" }).click();
  await expect(card).toContainText("Give the VO2 or the time, not both");
  await expect(card).not.toContainText("Set by the reviewer");
});

test("an override without a reason is refused and the typed values are kept", async ({ page }) => {
  await openDemo(page, /normal study/);
  const card = page.getByTestId("threshold-vt2");
  await card.getByText("set VT2 by hand").click();
  await card.locator('[name="vo2MlMin"]').fill("2100");
  await card.locator('[name="by"]').fill("E2E");
  await card.getByRole("button", { name: "Save override" }).click();
  // the browser refuses it before sending (the reason is required); the server's own refusal is a unit test
  expect(await card.locator('[name="reason"]').evaluate((el) => (el as HTMLInputElement).validity.valueMissing)).toBe(true);
  await expect(card).not.toContainText("Set by the reviewer");
  await expect(card.locator('[name="vo2MlMin"]')).toHaveValue("2100");
});

test("comparing two tests judges each change against published test-retest variability", async ({ page }) => {
  await page.goto("/compare");
  const form = page.getByTestId("compare-form");
  // options read "label (test N, added …)": serial tests of one patient are told apart by number and date
  const option = (name: string, text: string) => form.locator(`[name="${name}"] option`, { hasText: text });
  await expect(option("before", "deconditioning after illness")).toHaveText(
    /^Demo \(invented\): deconditioning after illness \(test \d+, added \d{4}-\d\d-\d\d/,
  );
  await form
    .locator('[name="before"]')
    .selectOption((await option("before", "deconditioning after illness").getAttribute("value"))!);
  await form
    .locator('[name="after"]')
    .selectOption((await option("after", "breathless runner, normal study").getAttribute("value"))!);
  await form.locator('[name="population"]').selectOption("healthy");
  await form.getByRole("button", { name: "Compare" }).click();
  // two different invented patients (40 y, 185 cm against 45 y, 178 cm): the page warns and withholds the verdicts
  await expect(page.getByTestId("patient-mismatch")).toBeVisible();
  await expect(page.getByTestId("verdict").first()).toContainText(/not judged|withheld|confirm/i);
  await expect(page.getByTestId("comparison")).not.toContainText("beyond measurement noise");
  // once the reviewer confirms both tests are of one patient, each change is judged against test-retest noise
  await page.getByTestId("compare-form").locator('[name="samePatient"]').check();
  await page.getByTestId("compare-form").getByRole("button", { name: "Compare" }).click();
  await expect(page.getByTestId("comparison")).toContainText("measurement noise");
  expect(await page.getByTestId("verdict").count()).toBeGreaterThan(0);
  await expect(page.getByTestId("clinical-caution")).toBeVisible();
});

test("lab settings choose the predicted-value equation named on every test without its own version", async ({ page }) => {
  await page.goto("/lab");
  const form = page.getByTestId("lab-form");
  await form.getByLabel("peak VO2, cycle").selectOption("jones-1985");
  await form.locator('[name="by"]').fill("E2E lab lead");
  await form.getByRole("button", { name: "Save lab defaults" }).click();
  await expect(form).toContainText("Lab defaults saved");
  await openDemo(page, /breathless runner/);
  await expect(page.getByTestId("row-peakVo2")).toContainText("Jones");
  // the equations page tags this lab's defaults with their ergometer
  await page.goto("/equations");
  await expect(page.getByTestId("lab-default-jones-1985")).toHaveText("lab default, cycle");
  await expect(page.getByTestId("lab-default-friend-2018")).toHaveText("lab default, treadmill");
  await expect(page.getByTestId("lab-default-hansen-1984")).toHaveCount(0);
  // Restore the documented default so other checks see Hansen 1984 again.
  await page.goto("/lab");
  await page.getByTestId("lab-form").getByLabel("peak VO2, cycle").selectOption("hansen-1984");
  await page.getByTestId("lab-form").locator('[name="by"]').fill("E2E lab lead");
  await page.getByTestId("lab-form").getByRole("button", { name: "Save lab defaults" }).click();
  await expect(page.getByTestId("lab-form")).toContainText("Lab defaults saved");
});

test("a reviewer sets the exercise phase by hand: a new version, refused when the end comes first, and undone", async ({
  page,
}) => {
  await openDemo(page, /deconditioning/);
  const box = page.getByTestId("exercise-span");
  await box.getByText("set the exercise phase by hand").click();
  const start = box.locator('[name="start"]');
  const end = box.locator('[name="end"]');
  // the form opens on the detected phase; move its start 30 s later
  const [m, s] = (await start.inputValue()).split(":").map(Number);
  const later = m * 60 + s + 30;
  const laterText = `${Math.floor(later / 60)}:${String(later % 60).padStart(2, "0")}`;
  const endText = await end.inputValue();
  await box.locator('[name="by"]').fill("E2E Reviewer");
  await box.locator('[name="reason"]').fill("ramp start from the test log");
  // an end before the start is refused and the typed values are kept
  await end.fill("0:10");
  await box.getByRole("button", { name: "Save exercise phase" }).click();
  await expect(box).toContainText("The end must come after the start");
  await expect(box.locator('[name="reason"]')).toHaveValue("ramp start from the test log");
  await end.fill(endText);
  await start.fill(laterText);
  await box.getByRole("button", { name: "Save exercise phase" }).click();
  await expect(box).toContainText("Exercise phase saved as a new analysis version");
  await expect(page.getByTestId("versions")).toContainText(`exercise phase set to ${laterText}`);
  await expect(page.getByText(`exercise ${laterText}–${endText}`)).toBeVisible();
  await expect(page.getByTestId("clinical-caution")).toBeVisible();
  await box.getByRole("button", { name: "Use the detected phase again" }).click();
  await expect(page.getByTestId("versions")).toContainText("exercise phase set by review removed");
});

test("a reviewer sets a span of breaths aside: refused without a reason, recomputed as a new version, and put back", async ({
  page,
}) => {
  await openDemo(page, /COPD, ventilatory limitation/);
  const box = page.getByTestId("set-aside");
  await box.getByText("set breaths aside by hand").click();
  await box.locator('[name="start"]').fill("8:00");
  await box.locator('[name="end"]').fill("8:30");
  await box.locator('[name="by"]').fill("E2E Reviewer");
  // no reason: refused by the browser before sending (the server refuses it too: tests/app), and the typed times are kept
  await box.getByRole("button", { name: "Set these breaths aside" }).click();
  expect(
    await box
      .locator('[name="reason"]')
      .first()
      .evaluate((el) => (el as HTMLInputElement).validity.valueMissing),
  ).toBe(true);
  await expect(box).not.toContainText("Span set aside");
  await expect(box.locator('[name="start"]')).toHaveValue("8:00");
  await box.locator('[name="reason"]').fill("mask leak noted on the test log");
  await box.getByRole("button", { name: "Set these breaths aside" }).click();
  await expect(box).toContainText("Span set aside in a new analysis version");
  await expect(page.getByTestId("versions")).toContainText("breaths 8:00–8:30 set aside: mask leak noted on the test log");
  await expect(box).toContainText("(1 span set aside)");
  await expect(box).toContainText("8:00–8:30: mask leak noted on the test log, by E2E Reviewer");
  // the data-quality list says how many breaths went and why, and the list of removed breaths names each
  await expect(page.locator('[data-code="breaths-set-aside-by-review"]').first()).toContainText(
    /The gas and ventilation values of \d+ breath\(s\) from 8:00 to 8:30 were set aside by review: mask leak noted on the test log, by E2E Reviewer\. Heart rate, SpO2 and the load there are kept\./,
  );
  await expect(page.getByText(/set aside by review \(8:00–8:30\): mask leak noted on the test log/).first()).toBeAttached();
  // the same span again is refused; so is one over most of the exercise phase
  await box.locator('[name="start"]').fill("8:05");
  await box.locator('[name="end"]').fill("8:25");
  await box.locator('form.stack [name="by"]').fill("E2E Reviewer");
  await box.locator('form.stack [name="reason"]').fill("the same leak again");
  await box.getByRole("button", { name: "Set these breaths aside" }).click();
  await expect(box).toContainText("8:05–8:25 is already set aside (8:00–8:30)");
  await box.locator('[name="start"]').fill("3:00");
  await box.locator('[name="end"]').fill("17:00");
  await box.getByRole("button", { name: "Set these breaths aside" }).click();
  await expect(box).toContainText("more than half of the exercise phase");
  await expect(page.getByTestId("clinical-caution")).toBeVisible();
  await box.locator("li").getByLabel("Reason").fill("leak not confirmed in the log");
  await box.locator("li").getByLabel("Reviewer").fill("E2E Second Reviewer");
  await box.getByRole("button", { name: "Use these breaths again" }).click();
  await expect(page.getByTestId("versions")).toContainText(
    "breaths 8:00–8:30 used again: leak not confirmed in the log, by E2E Second Reviewer",
  );
  await expect(box).not.toContainText("span set aside");
});

test("VO2 that rose implausibly little is not read until a reviewer says the cart was checked, and can be doubted again", async ({
  page,
}) => {
  // INVENTED: the normal-adult demo file with every gas volume scaled by 0.4, as a mask losing most of each breath would
  const lines = fs.readFileSync(path.join(__dirname, "../tests/fixtures/cases/normal-adult.csv"), "utf8").trim().split("\n");
  const header = lines[1].split(",");
  const scaled = new Set(["vo2_ml_min", "vco2_ml_min", "ve_l_min"].map((c) => header.indexOf(c)));
  const body = lines.slice(2).map((l) =>
    l
      .split(",")
      .map((x, i) => (scaled.has(i) ? String(Number(x) * 0.4) : x))
      .join(","),
  );
  const csv = ["# INVENTED leak variant of a synthetic test", lines[1], ...body].join("\n");
  await page.goto("/");
  const form = page.getByTestId("upload-form");
  await form.locator('[name="label"]').fill("E2E invented leak");
  await form.locator('[name="sex"]').selectOption("male");
  await form.locator('[name="ageY"]').fill("45");
  await form.locator('[name="heightCm"]').fill("178");
  await form.locator('[name="weightKg"]').fill("80");
  await form.locator('[name="ergometer"]').selectOption("cycle");
  await page.getByTestId("upload-file").setInputFiles({ name: "leak.csv", mimeType: "text/csv", buffer: Buffer.from(csv) });
  await page.getByTestId("upload-submit").click();
  await page.waitForURL(/\/tests\/\d+$/);
  await expect(page.locator('[data-code="vo2-too-low-for-work"]')).toContainText(
    "VO2-based values are shown but not interpreted",
  );
  const box = page.getByTestId("vo2-checked");
  await box.getByText("read VO2-based values after checking the cart").click();
  await box.locator('[name="by"]').fill("E2E Reviewer");
  await box.locator('[name="reason"]').fill("re-calibrated after the test; biological control within 3 %");
  // every check must be ticked: one missing is refused, naming it, and what was typed is kept
  for (const name of ["gas", "flow", "mask"]) await box.locator(`[name="${name}"]`).check();
  await box.getByRole("button", { name: "Read VO2-based values" }).click();
  await expect(box).toContainText("Tick that the ergometer's work-rate record was checked");
  await expect(box.locator('[name="reason"]')).toHaveValue("re-calibrated after the test; biological control within 3 %");
  await box.locator('[name="work"]').check();
  await box.getByRole("button", { name: "Read VO2-based values" }).click();
  await expect(page.locator('[data-code="vo2-read-at-review"]')).toContainText(
    "re-calibrated after the test; biological control within 3 %, by E2E Reviewer",
  );
  await expect(page.getByTestId("versions")).toContainText("VO2-based values read after a check");
  await expect(page.getByTestId("clinical-caution")).toBeVisible();
  await page.getByTestId("vo2-checked").getByLabel("Reason").fill("flow calibration found out of range");
  await page.getByTestId("vo2-checked").getByLabel("Reviewer").fill("E2E Second Reviewer");
  await page.getByTestId("vo2-checked").getByRole("button", { name: "Stop reading VO2-based values" }).click();
  await expect(page.locator('[data-code="vo2-too-low-for-work"]')).toBeVisible();
  await expect(page.getByTestId("versions")).toContainText(
    "VO2-based values no longer read (ΔVO2/ΔWR doubted): flow calibration found out of range, by E2E Second Reviewer",
  );
});
