import { expect, test, type Page } from "@playwright/test";

// Layout and labelling checks on the six INVENTED demo cases seeded on first start (lib/store/demoCases.ts).

/** Paths of every demo test's analysis page, read from the register (seeds the demo cases on first visit). */
async function demoTestPaths(page: Page): Promise<string[]> {
  await page.goto("/");
  const hrefs = await page.locator('main a[href^="/tests/"]').evaluateAll((as) => as.map((a) => a.getAttribute("href") ?? ""));
  const paths = [...new Set(hrefs.filter((h) => /^\/tests\/\d+$/.test(h)))];
  expect(paths.length).toBeGreaterThanOrEqual(6);
  return paths;
}

async function testIdOf(page: Page, label: RegExp): Promise<string> {
  await page.goto("/");
  const href = await page.getByRole("link", { name: label }).getAttribute("href");
  const id = /\/tests\/(\d+)$/.exec(href ?? "")?.[1];
  expect(id, `no demo test named ${label}`).toBeTruthy();
  return id!;
}

/**
 * Table cells whose text (outside block children such as notes or "how was this found?") is a number,
 * optionally with a unit or a range, and that is drawn on more than one line. A number that fits its
 * cell occupies one line box: all its client rects share one top.
 */
async function wrappedNumbers(page: Page): Promise<string[]> {
  return page.evaluate(() => {
    const NUMERIC = /^[<>≤≥+\-−]?\s?\d[\d.,:]*(\s?[–-]\s?\d[\d.,:]*)?(\s?[%A-Za-z/²·()0-9]+)?$/;
    const out: string[] = [];
    for (const cell of document.querySelectorAll<HTMLElement>("main td, main th")) {
      const nodes: Text[] = [];
      const walker = document.createTreeWalker(cell, NodeFilter.SHOW_TEXT);
      for (let n = walker.nextNode(); n; n = walker.nextNode()) {
        let el = n.parentElement;
        let inline = true;
        while (el && el !== cell) {
          if (!getComputedStyle(el).display.startsWith("inline")) inline = false;
          el = el.parentElement;
        }
        if (inline) nodes.push(n as Text);
      }
      const text = nodes
        .map((n) => n.data)
        .join("")
        .replace(/\s+/g, " ")
        .trim();
      if (!text || text.length > 30 || !NUMERIC.test(text)) continue;
      const range = document.createRange();
      range.setStart(nodes[0], 0);
      const last = nodes[nodes.length - 1];
      range.setEnd(last, last.length);
      const tops = new Set(
        [...range.getClientRects()].filter((r) => r.width > 0 && r.height > 0).map((r) => Math.round(r.top / 3)),
      );
      if (tops.size > 1) out.push(`${location.pathname}: "${text}" on ${tops.size} lines`);
    }
    return out;
  });
}

async function pagesToCheck(page: Page): Promise<string[]> {
  const tests = await demoTestPaths(page);
  const runner = await testIdOf(page, /breathless runner/);
  const vascular = await testIdOf(page, /pulmonary vascular/);
  return [
    ...tests,
    `/tests/${runner}/report`,
    `/tests/${vascular}/report`,
    `/compare?before=${runner}&after=${vascular}&population=healthy`,
    `/compare?before=${runner}&after=${vascular}&population=healthy&samePatient=confirmed`,
    "/equations",
    "/lab",
    "/",
  ];
}

for (const width of [1280, 390]) {
  test(`at ${width} px no number in a table breaks across lines`, async ({ page }) => {
    const paths = await pagesToCheck(page);
    await page.setViewportSize({ width, height: 900 });
    const broken: string[] = [];
    for (const p of paths) {
      await page.goto(p);
      await expect(page.getByTestId("clinical-caution")).toBeVisible();
      const cells = await page.locator("main td.num").count();
      if (/^\/tests\/\d+$/.test(p)) expect(cells, `${p} has numeric cells`).toBeGreaterThan(10);
      broken.push(...(await wrappedNumbers(page)));
    }
    expect(broken).toEqual([]);
  });
}

test("at 390 px no page scrolls sideways: wide tables and charts scroll inside their own box", async ({ page }) => {
  const paths = await pagesToCheck(page);
  await page.setViewportSize({ width: 390, height: 844 });
  const tooWide: string[] = [];
  for (const p of paths) {
    await page.goto(p);
    const { scrollWidth, viewport } = await page.evaluate(() => ({
      scrollWidth: document.documentElement.scrollWidth,
      viewport: window.innerWidth,
    }));
    if (scrollWidth > viewport) tooWide.push(`${p}: ${scrollWidth} px in a ${viewport} px window`);
  }
  expect(tooWide).toEqual([]);
});

test("the analysis page's charts are images named after what they show", async ({ page }) => {
  await page.goto(`/tests/${await testIdOf(page, /breathless runner/)}`);
  // The figure is the image (its drawing inside is presentational), labelled with what it shows.
  const charts = page.getByTestId("charts").locator('figure[role="img"]');
  await expect(charts).toHaveCount(5);
  for (const label of await charts.evaluateAll((fs) => fs.map((f) => f.getAttribute("aria-label") ?? "")))
    expect(label).toMatch(/^[A-Z].+\. Shows .+ against .+/);
  await expect(
    page.getByRole("img", {
      name: /^Time course\. Shows VO2, VCO2, Heart rate and Work rate against Time \(min\); .*marked: VT1 at \d+:\d\d/,
    }),
  ).toBeVisible();
  await expect(
    page.getByRole("img", { name: /^V-slope: VCO2 against VO2\. Shows .* against VO2 \(mL\/min\); marked: VT1 at \d+ mL\/min$/ }),
  ).toBeVisible();
});

test("the effort check shows one verdict in words, without internal ids", async ({ page }) => {
  await page.goto(`/tests/${await testIdOf(page, /breathless runner/)}`);
  const effort = page.getByTestId("effort");
  await expect(effort.getByTestId("effort-verdict")).toHaveText(/\w.+\.$/);
  await expect(effort.getByTestId("effort-criteria").locator("li")).toHaveCount(5);
  // the criterion is always named by what it asks, with its outcome (never "No VO2 plateau: not met")
  await expect(effort).toContainText(/VO2 plateau at peak: (met|not met|not assessable)/);
  await expect(effort).toContainText(/Breathing reserve exhausted \(ventilatory limitation\): (met|not met|not assessable)/);
  await expect(effort).not.toContainText("No VO2 plateau:");
  await expect(effort).not.toContainText("vo2-plateau-2.1-ml-kg");
  await expect(effort).not.toContainText("Criteria set");
});

test("heart rate is given in bpm and PETCO2 at VT1 is labelled as such", async ({ page }) => {
  await page.goto(`/tests/${await testIdOf(page, /breathless runner/)}`);
  await expect(page.getByTestId("row-peakHr")).toContainText("bpm");
  await expect(page.getByTestId("domains")).toContainText("Heart rate (bpm)");
  // Heart rate in "/min" or "1/min" anywhere visible (breathing frequency keeps "/min").
  expect(await page.locator("main").innerText()).not.toMatch(
    /(HR|heart rate|heart-rate)[^\n.;]{0,40}?\d+(\.\d+)?\s*(1\/min|\/min)|hrBpm \(1\/min\)/i,
  );
  const indices = page.getByTestId("indices");
  await expect(indices.getByRole("row", { name: /^PETCO2 at VT1/ })).toContainText("rise from rest");
  // the rise is read from rest to VT1 and given there once, not beside the highest PETCO2
  await expect(indices.getByRole("row", { name: /^Highest PETCO2 during exercise/ })).not.toContainText("rise");
  await expect(indices).not.toContainText("rise to VT1");
});

test("a reviewer's threshold shows who set it and why instead of a confidence", async ({ page }) => {
  await page.goto(`/tests/${await testIdOf(page, /ventilatory limitation/)}`);
  const card = page.getByTestId("threshold-vt1");
  await expect(card.getByTestId("confidence-vt1")).toBeVisible();
  await card.getByText("set VT1 by hand").click();
  await card.locator('[name="vo2MlMin"]').fill("1200");
  await card.locator('[name="by"]').fill("E2E Layout Reviewer");
  await card.locator('[name="reason"]').fill("nadir of VE/VO2 at this point");
  await card.getByRole("button", { name: "Save override" }).click();
  await expect(card.getByTestId("set-by-vt1")).toHaveText(
    "Set by the reviewer (E2E Layout Reviewer): nadir of VE/VO2 at this point",
  );
  await expect(card.getByTestId("confidence-vt1")).toHaveCount(0);
  const remove = card.getByTestId("remove-override-vt1");
  await remove.locator('[name="reason"]').fill("layout check done");
  await remove.locator('[name="by"]').fill("E2E Layout Reviewer");
  await remove.getByRole("button", { name: "Remove override" }).click();
  await expect(card.getByTestId("confidence-vt1")).toBeVisible();
});

test("comparing two different patients warns and withholds the change verdicts", async ({ page }) => {
  const runner = await testIdOf(page, /breathless runner/); // invented: male, 45 y, 178 cm
  const vascular = await testIdOf(page, /pulmonary vascular/); // invented: female, 52 y, 165 cm
  await page.goto("/compare");
  const form = page.getByTestId("compare-form");
  await form.locator('[name="before"]').selectOption(runner);
  await form.locator('[name="after"]').selectOption(vascular);
  await form.locator('[name="population"]').selectOption("healthy");
  await form.getByRole("button", { name: "Compare" }).click();
  const warning = page.getByTestId("patient-mismatch");
  await expect(warning).toBeVisible();
  await expect(warning).toContainText("may not be of the same patient");
  await expect(warning).toContainText("sex differs: male in the earlier test, female in the later one");
  await expect(warning).toContainText("height differs by 13 cm (178 cm, then 165 cm), more than 5 cm (our choice)"); // |165 − 178| = 13 cm > 5 cm
  const verdicts = page.getByTestId("comparison").getByTestId("verdict");
  await expect(verdicts.first()).toBeVisible();
  for (const text of await verdicts.allInnerTexts()) expect(text).not.toMatch(/(beyond|within) measurement noise/);
  await expect(page.getByTestId("clinical-caution")).toBeVisible();
});

test("choosing one test as both the earlier and the later test is refused with a message", async ({ page }) => {
  const runner = await testIdOf(page, /breathless runner/);
  await page.goto("/compare");
  const form = page.getByTestId("compare-form");
  await form.locator('[name="before"]').selectOption(runner);
  await form.locator('[name="after"]').selectOption(runner);
  await form.locator('[name="population"]').selectOption("healthy");
  await form.getByRole("button", { name: "Compare" }).click();
  await expect(page.getByTestId("same-test")).toContainText("The same test is chosen as both the earlier and the later test");
  await expect(page.getByTestId("comparison")).toHaveCount(0);
  await expect(page.getByTestId("verdict")).toHaveCount(0);
  await expect(page.getByTestId("clinical-caution")).toBeVisible();
});

test("the sameness check lists details beyond their limit and names those within it", async ({ page }) => {
  const runner = await testIdOf(page, /breathless runner/); // invented: male, 45 y, 178 cm
  const heart = await testIdOf(page, /heart failure assessment/); // invented: male, 62 y, 174 cm
  await page.goto(`/compare?before=${runner}&after=${heart}&population=healthy`);
  const warning = page.getByTestId("patient-mismatch");
  // 62 − 45 = 17 y > 3 y between repeat tests (our choice) + 1 y whole-year rounding
  await expect(warning).toContainText("age differs by 17 y (45 y, then 62 y)");
  // |174 − 178| = 4 cm ≤ 5 cm (our choice): not a reason to refuse, but named so the reader sees it
  await expect(warning.getByTestId("within-limit")).toHaveText(
    "height differs by 4 cm (178 cm, then 174 cm) (within the limit: 5 cm, our choice)",
  );
  await expect(warning).toContainText("are our choice, not published cut-offs");
});

test("confirmed serial tests name the noise population and round as elsewhere", async ({ page }) => {
  const runner = await testIdOf(page, /breathless runner/);
  const vascular = await testIdOf(page, /pulmonary vascular/);
  await page.goto(`/tests/${runner}`);
  const peak = (await page.getByTestId("row-peakVo2").locator("td.num").first().innerText()).split(/\s/)[0];
  await page.goto(`/compare?before=${runner}&after=${vascular}&population=healthy&samePatient=confirmed`);
  await expect(page.getByTestId("compare-population")).toContainText("Healthy adults");
  const row = page.getByTestId("compare-peakVo2MlMin");
  await expect(row.locator("td.num").nth(0)).toHaveText(peak);
  await expect(row.getByTestId("verdict")).toContainText(/(beyond|within) measurement noise|not judged/);
  await expect(page.getByTestId("comparison").getByTestId("verdict").first()).toBeVisible();
  await expect(page.getByTestId("comparison")).toContainText(/population: healthy adults/i);
});

test("the analysis page shows messages and plain names, never internal codes", async ({ page }) => {
  await page.goto(`/tests/${await testIdOf(page, /breathless runner/)}`);
  await page.evaluate(() => document.querySelectorAll("details").forEach((d) => (d.open = true)));
  const text = await page.locator("main").innerText();
  // issue codes stay in a data attribute for developers, not in the text
  expect(text).not.toMatch(/\[[a-z0-9]+(-[a-z0-9]+)+\]/);
  const codes = await page.locator("#quality ~ ul.issues li[data-code]").count();
  expect(codes).toBeGreaterThan(0);
  // canonical field names and method ids never reach the reader
  expect(text).not.toMatch(/\b(timeS|vo2MlMin|vco2MlMin|veLMin|hrBpm|vePeakLMin|mvvLMin)\b/);
  expect(text).not.toMatch(/\bvt[12]-[a-z-]+/);
  const columns = page.getByTestId("column-decisions");
  await expect(columns.getByRole("row", { name: /^time_s/ })).toContainText("Time (s)");
  await expect(columns.getByRole("row", { name: /^ve_l_min/ })).toContainText("VE (L/min)");
  await expect(columns.getByRole("row", { name: /^hr_bpm/ })).toContainText("Heart rate (bpm)");
  // provenance inputs in words with units: "MVV 156.0 L/min; VE peak 90.3 L/min", a time as m:ss
  await expect(page.getByTestId("indices")).toContainText(/VE peak \d+\.\d\sL\/min/);
  await expect(page.getByTestId("indices")).toContainText(/Inputs: time \d+:\d\d/);
  await expect(page.getByTestId("threshold-vt1")).toContainText(/Inputs: methods: VT1 /);
});

test("the equations page names each quantity and its unit in words", async ({ page }) => {
  await page.goto("/equations");
  const list = page.getByTestId("equation-list");
  await expect(list).toContainText("lowest VE/VCO2 (no unit)");
  await expect(list).toContainText("maximal heart rate (bpm)");
  await expect(list).not.toContainText("veVco2NadirRatio");
});

test("at 390 px register dates stay whole and the analysis tables scroll instead of growing tall rows", async ({ page }) => {
  const runner = await testIdOf(page, /breathless runner/);
  await page.setViewportSize({ width: 390, height: 844 });
  await page.goto("/");
  for (const cell of await page.getByTestId("test-list").locator("tbody td:nth-child(5)").all()) {
    const text = (await cell.innerText()).trim();
    expect(text).toMatch(/^\d{4}-\d\d-\d\d \d\d:\d\d$/);
    const box = await cell.boundingBox();
    const lines = await cell.evaluate((td) => {
      const r = document.createRange();
      r.selectNodeContents(td);
      return new Set([...r.getClientRects()].filter((x) => x.width > 0).map((x) => Math.round(x.top))).size;
    });
    expect(lines, `date "${text}" in ${box?.height} px`).toBe(1);
  }
  await page.goto(`/tests/${runner}`);
  // open the table folded in its own panel; each row's "how was this found?" and sources stay folded
  await page.getByText("Each method's estimate").click();
  await expect(page.getByTestId("threshold-methods")).toBeVisible();
  const tall = await page.evaluate(() =>
    [...document.querySelectorAll<HTMLElement>("main .table-scroll > table")].flatMap((t) =>
      [...t.querySelectorAll("tbody > tr")]
        .map((tr) => tr.getBoundingClientRect().height)
        .filter((h) => h > 200)
        .map((h) => `${t.dataset.testid}: row ${Math.round(h)} px`),
    ),
  );
  expect(tall).toEqual([]);
});

test("the site icon is served", async ({ request }) => {
  const ico = await request.get("/favicon.ico");
  expect(ico.status()).toBe(200);
  expect(ico.headers()["content-type"]).toContain("icon");
});
