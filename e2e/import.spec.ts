import { expect, test, type Page } from "@playwright/test";
import { plainRampCsv } from "./fixtures/plain-ramp.csv";
import { AnalysisPage, ColumnReviewPage, InputsPage, testIdFromUrl } from "./pages/ImportPages";
import { RegisterPage } from "./pages/RegisterPage";

/**
 * INVENTED synthetic export in a layout made up for these tests: four lines of details above the header,
 * semicolons, decimal commas, m:ss times and headers with apostrophes and bracketed units.
 * Every 5 s: rest (0 W, VO2 350 mL/min) for `restS`, then a 600-s ramp from `startW` to 200 W with
 * VO2 = 600 + 10 × W mL/min (so ΔVO2/ΔWR = 10 mL/min/W by construction), VCO2 bending upwards above
 * 1500 mL/min, VE = 27 × VCO2 / 1000 + 2 L/min. VO2 and VCO2 are written in L/min.
 */
function inventedExport(opts: { vo2Header?: string; startW?: number } = {}): string {
  const vo2Header = opts.vo2Header ?? "V'O2 [L/min]";
  const startW = opts.startW ?? 0;
  const restS = startW > 0 ? 0 : 120;
  const dec = (x: number, d: number) => x.toFixed(d).replace(".", ",");
  const clock = (t: number) => `${Math.floor(t / 60)}:${String(t % 60).padStart(2, "0")}`;
  const lines = [
    "Exercise record export (INVENTED synthetic sample)",
    "Subject: E2E case",
    "Body mass: 80 kg",
    "Protocol: ramp",
    "",
    `Elapsed [m:ss];${vo2Header};V'CO2 [L/min];V'E [L/min];Pulse [1/min];Power [W]`,
  ];
  for (let t = 0; t <= restS + 600; t += 5) {
    const w = t < restS ? 0 : startW + ((200 - startW) * (t - restS)) / 600;
    const vo2 = t < restS ? 350 : 600 + 10 * w;
    const vco2 = vo2 < 1500 ? vo2 * 0.85 : 1275 + (vo2 - 1500) * 1.25;
    lines.push(
      [
        clock(t),
        dec(vo2 / 1000, 3),
        dec(vco2 / 1000, 3),
        dec((vco2 * 27) / 1000 + 2, 1),
        Math.round(70 + vo2 / 30),
        Math.round(w),
      ].join(";"),
    );
  }
  return lines.join("\r\n") + "\r\n";
}

const PATIENT = { sex: "male", ageY: "50", heightCm: "178", weightKg: "80" };

async function uploadAndOpen(page: Page, name: string, content: string, details: Record<string, string>): Promise<number> {
  const register = new RegisterPage(page);
  await register.open();
  await register.upload({ name, content }, details);
  await page.waitForURL(/\/tests\/\d+$/);
  return testIdFromUrl(page);
}

test("(a) a semicolon, decimal-comma file with details lines and unfamiliar headers is recognised column by column, with reasons", async ({
  page,
}) => {
  await uploadAndOpen(page, "invented-export.csv", inventedExport(), { label: "E2E invented export", ...PATIENT });
  // Known by construction: the highest 30-s average is the mean of the last 7 samples (690–720 s),
  // i.e. VO2 at 705 s = 600 + 10 × (200 × 585 / 600) = 2550 mL/min.
  const analysis = new AnalysisPage(page);
  expect(await analysis.peakVo2MlMin()).toBeCloseTo(2550, 0);
  await page.getByTestId("columns-link").first().click();
  await page.waitForURL(/\/columns$/);
  const review = new ColumnReviewPage(page);
  await expect(page.getByTestId("file-facts")).toContainText("semicolon-separated");
  await expect(page.getByTestId("file-facts")).toContainText("decimal mark “,”");
  await expect(page.getByTestId("file-facts")).toContainText("Body mass: 80 kg");
  await expect(review.row("Elapsed [m:ss]").getByTestId("read-as")).toHaveText("Time (m:ss)");
  await expect(review.row("Elapsed [m:ss]").getByTestId("reason")).toContainText("m:ss, converted to seconds");
  await expect(review.row("V'O2 [L/min]").getByTestId("read-as")).toHaveText("VO2 (L/min)");
  await expect(review.row("V'O2 [L/min]").getByTestId("reason")).toContainText("recognised name");
  await expect(review.row("V'O2 [L/min]").getByTestId("reason")).toContainText("unit L/min from the header");
  await expect(review.row("Pulse [1/min]").getByTestId("read-as")).toHaveText("Heart rate (1/min)");
  await expect(review.row("Power [W]").getByTestId("read-as")).toHaveText("Work rate (W)");
  // Sample values are shown as written in the file (decimal comma kept).
  await expect(review.row("V'O2 [L/min]")).toContainText("0,350");
  // issue codes are for developers (data-code), the user reads the message
  await expect(page.getByTestId("import-issues").locator('[data-code="metadata-found"]')).toHaveCount(1);
  await expect(page.getByTestId("clinical-caution")).toBeVisible();
  await page.screenshot({ path: "reports/screenshots/import-columns-recognised.png", fullPage: true });
});

test("(b) overriding a wrongly stated unit and re-reading changes peak VO2 to the value the new unit gives", async ({ page }) => {
  // The header says mL/kg/min but the values are L/min (1.1–2.6). Read per kg × 80 kg they give
  // VO2 88–208 mL/min against VCO2 935–2650 mL/min: RER ≈ 10, so the analysis sets every breath aside.
  const file = inventedExport({ vo2Header: "V'O2 [mL/kg/min]", startW: 50 });
  const id = await uploadAndOpen(page, "mislabelled.csv", file, { label: "E2E mislabelled unit", ...PATIENT });
  const analysis = new AnalysisPage(page);
  expect(await analysis.peakVo2MlMin()).toBeNull();

  const review = new ColumnReviewPage(page);
  await review.open(id);
  await expect(review.row("V'O2 [mL/kg/min]").getByTestId("read-as")).toHaveText("VO2 (mL/kg/min)");
  await review.setUnit("V'O2 [mL/kg/min]", "L/min");
  await review.reread();
  await expect(page.getByTestId("columns-ok")).toContainText("read again");
  await expect(review.row("V'O2 [mL/kg/min]").getByTestId("reason")).toContainText("set by user: L/min");
  await expect(review.row("V'O2 [mL/kg/min]").getByTestId("read-as")).toHaveText("VO2 (L/min)");
  await page.screenshot({ path: "reports/screenshots/import-columns-override.png", fullPage: true });

  // Known by construction: ramp 50 → 200 W over 600 s, so the last 7 samples (570–600 s) average to
  // VO2 at 585 s = 600 + 10 × (50 + 150 × 585 / 600) = 2562.5 mL/min (values written to 3 decimals in L/min).
  await analysis.open(id);
  const after = await analysis.peakVo2MlMin();
  expect(after).not.toBeNull();
  expect(Math.abs(after! - 2562.5)).toBeLessThanOrEqual(1);
  // The patient details and referral entered at upload were kept through the re-read.
  await expect(page.getByTestId("test-title")).toHaveText("E2E mislabelled unit");
  await expect(page.locator("main")).toContainText("80 kg");
});

test("(c) choices saved as a profile are applied to the next file of the same layout as set by user", async ({ page }) => {
  const file = inventedExport({ vo2Header: "V'O2 [mL/kg/min]", startW: 50 });
  const first = await uploadAndOpen(page, "layout-1.csv", file, { label: "E2E profile source", ...PATIENT });
  const review = new ColumnReviewPage(page);
  await review.open(first);
  await review.setUnit("V'O2 [mL/kg/min]", "L/min");
  await review.saveProfile("E2E mislabelled VO2 export");
  await expect(page.getByTestId("columns-ok")).toContainText('Saved as profile "E2E mislabelled VO2 export"');
  // The choice typed on the form survives the answer.
  await expect(review.row("V'O2 [mL/kg/min]").getByTestId("unit-select")).toHaveValue("L/min");
  // A taken name is refused with a clear message, and nothing typed is lost.
  await review.saveProfile("e2e mislabelled vo2 export");
  await expect(page.getByTestId("profile-error")).toContainText("already exists");
  await expect(page.getByTestId("profile-name")).toHaveValue("e2e mislabelled vo2 export");
  await expect(review.row("V'O2 [mL/kg/min]").getByTestId("unit-select")).toHaveValue("L/min");

  await page.goto("/profiles");
  const profile = page.getByTestId("profile").filter({ hasText: "E2E mislabelled VO2 export" });
  await expect(profile).toContainText("V'O2 [mL/kg/min]");
  await expect(profile).toContainText("L/min");
  await page.screenshot({ path: "reports/screenshots/import-profiles.png", fullPage: true });

  const second = await uploadAndOpen(page, "layout-2.csv", file, {
    label: "E2E read with profile",
    profile: "E2E mislabelled VO2 export",
    ...PATIENT,
  });
  expect(second).not.toBe(first);
  const analysis = new AnalysisPage(page);
  // Same by-construction value as in (b): 2562.5 mL/min.
  expect(Math.abs((await analysis.peakVo2MlMin())! - 2562.5)).toBeLessThanOrEqual(1);
  await review.open(second);
  await expect(page.getByTestId("profile-used")).toContainText("E2E mislabelled VO2 export");
  const vo2 = review.row("V'O2 [mL/kg/min]");
  await expect(vo2.getByTestId("reason")).toContainText("set by user");
  await expect(vo2.getByTestId("reason")).toContainText("set by user: L/min");
  await expect(vo2.getByTestId("unit-select")).toHaveValue("L/min");
  // Columns the profile does not name are still recognised automatically.
  await expect(review.row("Pulse [1/min]").getByTestId("reason")).toContainText("recognised name");

  // Deleting the profile removes it from the list; the test read with it keeps its reading.
  await page.goto("/profiles");
  await page.getByTestId("profile").filter({ hasText: "E2E mislabelled VO2 export" }).getByTestId("delete-profile").click();
  await expect(page.getByTestId("profile").filter({ hasText: "E2E mislabelled VO2 export" })).toHaveCount(0);
  await review.open(second);
  await expect(review.row("V'O2 [mL/kg/min]").getByTestId("read-as")).toHaveText("VO2 (L/min)");
});

test("(d) a refused file becomes usable after its columns are mapped by hand", async ({ page }) => {
  // The plain ramp (INVENTED, answer known by construction: peak 2500 mL/min) with meaningless headers.
  const body = plainRampCsv().split("\n").slice(1).join("\n");
  const file = `ch1,ch2,ch3,ch4,ch5,ch6,ch7\n${body}`;
  const id = await uploadAndOpen(page, "unnamed-channels.csv", file, { label: "E2E unnamed channels" });
  await expect(page.getByTestId("refused")).toBeVisible();
  await page.getByTestId("refused").getByTestId("columns-link").click();
  await page.waitForURL(/\/columns$/);
  const review = new ColumnReviewPage(page);
  await expect(page.getByTestId("import-status")).toContainText("refused");
  await expect(review.row("ch1").getByTestId("reason")).toContainText("not a recognised column name");
  await expect(page.getByTestId("import-issues").locator('[data-code="no-time-column"]')).toHaveCount(1);

  const plan: [string, string, string | null][] = [
    ["ch1", "Time", "s"],
    ["ch2", "VO2", "mL/min"],
    ["ch3", "VCO2", "mL/min"],
    ["ch4", "VE (ventilation)", "L/min"],
    ["ch5", "Heart rate", "1/min"],
    ["ch6", "Work rate", "W"],
    ["ch7", "Phase or marker text", null],
  ];
  for (const [header, field, unit] of plan) {
    await review.setField(header, field);
    if (unit) await review.setUnit(header, unit);
  }
  // A validation error (age out of range) keeps every choice and value.
  await review.fill("ageY", "400");
  await review.fill("sex", "male");
  await review.fill("heightCm", "175");
  await review.fill("weightKg", "80");
  await review.reread();
  await expect(page.getByText("Age (years) must be at most 110")).toBeVisible();
  await expect(review.row("ch2").getByTestId("field-select")).toHaveValue("vo2MlMin");
  await expect(review.row("ch2").getByTestId("unit-select")).toHaveValue("mL/min");
  await expect(page.locator('[name="heightCm"]')).toHaveValue("175");

  await review.fill("ageY", "50");
  await review.reread();
  await expect(page.getByTestId("columns-ok")).toContainText("now usable");
  await expect(page.getByTestId("import-status")).toContainText("imported");
  await expect(review.row("ch2").getByTestId("read-as")).toHaveText("VO2 (mL/min)");
  await page.screenshot({ path: "reports/screenshots/import-refused-mapped.png", fullPage: true });

  const analysis = new AnalysisPage(page);
  await analysis.open(id);
  await expect(page.getByTestId("refused")).toHaveCount(0);
  expect(await analysis.peakVo2MlMin()).toBeCloseTo(2500, 0);
  await expect(page.locator("main")).toContainText("80 kg");
});

test("(e) a lactate file added on the inputs page gives the analysis a lactate thresholds section", async ({ page }) => {
  const id = await uploadAndOpen(page, "invented-export.csv", inventedExport(), { label: "E2E lactate", ...PATIENT });
  await expect(page.getByTestId("lactate")).toHaveCount(0);
  await page.getByTestId("inputs-link").click();
  const inputs = new InputsPage(page);
  await expect(page.getByTestId("inputs-title")).toBeVisible();
  // INVENTED samples every 2 min; on this ramp (rest to 2:00, then 20 W/min) they fall at 0–200 W.
  const lactate = "Time [min];Lactate [mmol/L]\r\n2;1,0\r\n4;1,1\r\n6;1,3\r\n8;2,0\r\n10;3,6\r\n12;6,2\r\n";
  await inputs.uploadLactate({ name: "invented-lactate.csv", content: lactate });
  await expect(page.getByTestId("lactate-ok")).toContainText("6 lactate sample(s) saved");
  await expect(page.getByTestId("lactate-stored").locator("tbody tr")).toHaveCount(6);
  await expect(page.getByTestId("lactate-stored")).toContainText("6.2");

  // Blood gases in kPa are converted (1 kPa = 7.50062 mmHg, standard definition): 12.5 kPa → 93.76 mmHg,
  // 5.2 kPa → 39.00 mmHg. INVENTED values.
  const gases = page.getByTestId("bloodgas-form");
  await gases.getByTestId("bloodgas-file").setInputFiles({
    name: "invented-gases.csv",
    mimeType: "text/csv",
    buffer: Buffer.from("Time [min];PaO2 [kPa];PaCO2 [kPa];Label\r\n1;12,5;5,2;rest\r\n12;11,8;4,6;peak\r\n"),
  });
  await gases.getByTestId("bloodgas-submit").click();
  await expect(page.getByTestId("bloodgas-ok")).toContainText("2 blood gas sample(s) saved");
  await expect(page.getByTestId("bloodgas-stored")).toContainText("93.8");
  await expect(page.getByTestId("bloodgas-stored")).toContainText("39.0");

  // Spirometry: an implausible FEV1 is refused and what was typed stays; a plausible set is saved.
  const spiro = page.getByTestId("spirometry-form");
  await spiro.locator('[name="fev1L"]').fill("31");
  await spiro.locator('[name="fvcL"]').fill("4.0");
  await spiro.getByTestId("spirometry-submit").click();
  // the whole form is refused: the field's problem, and that nothing was saved (not "left out" while the rest saves)
  await expect(page.getByTestId("spirometry-error").filter({ hasText: "FEV1" })).toHaveText(
    "FEV1 (L) must lie between 0.2 and 8, got 31.",
  );
  await expect(page.getByTestId("spirometry-error").filter({ hasText: "Nothing was saved" })).toBeVisible();
  await expect(spiro.locator('[name="fvcL"]')).toHaveValue("4.0");
  await spiro.locator('[name="fev1L"]').fill("3.1");
  await spiro.getByTestId("spirometry-submit").click();
  await expect(page.getByTestId("spirometry-ok")).toBeVisible();
  await expect(spiro.locator('[name="fev1L"]')).toHaveValue("3.1");

  // A context value out of range is refused with the typed values kept.
  const ctx = page.getByTestId("context-form");
  await ctx.locator('[name="resectedSegments"]').fill("25");
  await ctx.locator('[name="stairClimbM"]').fill("18");
  await ctx.getByTestId("context-submit").click();
  await expect(page.getByTestId("context-error")).toContainText("at most 19");
  await expect(ctx.locator('[name="stairClimbM"]')).toHaveValue("18");
  await ctx.locator('[name="resectedSegments"]').fill("4");
  await ctx.getByTestId("context-submit").click();
  await expect(page.getByTestId("context-ok")).toBeVisible();
  await expect(page.getByTestId("clinical-caution")).toBeVisible();
  await page.screenshot({ path: "reports/screenshots/import-inputs-lactate.png", fullPage: true });

  const analysis = new AnalysisPage(page);
  await analysis.open(id);
  await expect(page.getByTestId("lactate")).toBeVisible();
  await page.getByTestId("lactate").scrollIntoViewIfNeeded();
  await page.screenshot({ path: "reports/screenshots/import-analysis-lactate.png" });
});

test("(f) a stage table without a time column: the length of each stage is set on the review page and the file is read again", async ({
  page,
}) => {
  // INVENTED six-stage table (load steps of 50 W, no time column): by construction the rows are stages, not breaths.
  const rows = ["Stage,Load (W),VO2 (mL/min),VCO2 (mL/min),VE (L/min),HR (bpm)"];
  for (let s = 1; s <= 6; s++) {
    const w = 50 * s;
    const vo2 = 600 + 10 * w;
    rows.push([s, w, vo2, Math.round(vo2 * (0.85 + 0.04 * s)), (vo2 * 0.03).toFixed(1), 80 + 15 * s].join(","));
  }
  const id = await uploadAndOpen(page, "stages.csv", rows.join("\n") + "\n", { label: "E2E stage table", ...PATIENT });
  const review = new ColumnReviewPage(page);
  await review.open(id);
  // default spacing 60 s until told otherwise
  await expect(page.getByTestId("import-issues")).toContainText("60 s apart");
  await expect(page.getByTestId("stage-duration")).toBeVisible();
  await review.fill("stageDurationS", "180");
  await review.reread();
  await expect(page.getByTestId("columns-ok")).toContainText("read again");
  await expect(page.getByTestId("import-issues")).toContainText("6 rows were read as consecutive stages 180 s apart");
  await expect(page.getByTestId("stage-duration")).toHaveValue("180");
  await expect(page.getByTestId("clinical-caution")).toBeVisible();
});
