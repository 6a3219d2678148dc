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
    `/compare?before=${runner}&after=${runner}&population=healthy`,
    `/compare?before=${runner}&after=${vascular}&population=healthy`,
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
  await expect(indices.getByRole("row", { name: /^Highest PETCO2 during exercise/ })).toContainText(
    "highest exercise value minus rest",
  );
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
  await card.getByRole("button", { name: "Remove override" }).click();
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
  await expect(warning).toContainText("height differs by 13 cm"); // |165 − 178| = 13 cm > 5 cm
  const verdicts = page.getByTestId("comparison").getByTestId("verdict");
  await expect(verdicts.first()).toBeVisible();
  for (const text of await verdicts.allInnerTexts()) expect(text).not.toMatch(/(beyond|within) measurement noise/);
  await expect(page.getByTestId("clinical-caution")).toBeVisible();
});

test("comparing a test with itself names the noise population and rounds as elsewhere", async ({ page }) => {
  const runner = await testIdOf(page, /breathless runner/);
  await page.goto(`/tests/${runner}`);
  const peak = (await page.getByTestId("row-peakVo2").locator("td.num").first().innerText()).split(" ")[0];
  await page.goto(`/compare?before=${runner}&after=${runner}&population=healthy`);
  await expect(page.getByTestId("patient-mismatch")).toHaveCount(0);
  await expect(page.getByTestId("compare-population")).toContainText("Healthy adults");
  const row = page.getByTestId("compare-peakVo2MlMin");
  await expect(row.locator("td.num").nth(0)).toHaveText(peak);
  // The same test twice: every change is 0 by construction, so a judged change is within the noise band.
  await expect(row.getByTestId("verdict")).toContainText("within measurement noise");
  await expect(row.getByTestId("verdict")).toContainText(/population: healthy adults/i);
});

test("the site icon is served", async ({ request }) => {
  const ico = await request.get("/favicon.ico");
  expect(ico.status()).toBe(200);
  expect(ico.headers()["content-type"]).toContain("icon");
});
