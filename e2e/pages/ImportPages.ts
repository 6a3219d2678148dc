import { expect, type Locator, type Page } from "@playwright/test";

/** Test id from the current URL (/tests/<id>...). */
export function testIdFromUrl(page: Page): number {
  const m = /\/tests\/(\d+)/.exec(page.url());
  if (!m) throw new Error(`not on a test page: ${page.url()}`);
  return Number(m[1]);
}

/** The analysis view of one test: the numbers the import scenarios check. */
export class AnalysisPage {
  constructor(private readonly page: Page) {}

  async open(testId: number) {
    await this.page.goto(`/tests/${testId}`);
  }

  /** Measured peak VO2 (mL/min) as shown in the key-results table; null when shown as not determinable. */
  async peakVo2MlMin(): Promise<number | null> {
    const cell = this.page.getByTestId("row-peakVo2").locator("td.num").first();
    await expect(cell).toBeVisible();
    const text = (await cell.innerText()).replace(/\s/g, "");
    const m = /^(-?\d+(?:\.\d+)?)/.exec(text);
    return m ? Number(m[1]) : null;
  }
}

/** The column review page: every column of the kept file, its reading, and the user's choices. */
export class ColumnReviewPage {
  constructor(private readonly page: Page) {}

  async open(testId: number) {
    await this.page.goto(`/tests/${testId}/columns`);
    await expect(this.page.getByTestId("column-review")).toBeVisible();
  }

  /** The table row of the column whose header is exactly `header`. */
  row(header: string): Locator {
    return this.page
      .getByTestId("column-review")
      .locator("tbody tr")
      .filter({ has: this.page.locator("td:first-child strong", { hasText: new RegExp(`^${escapeRegExp(header)}$`) }) });
  }

  /** Choose what a column holds by the option's label ("VO2", "Time", "ignore this column"). */
  async setField(header: string, label: string) {
    await this.row(header).getByTestId("field-select").selectOption({ label });
  }

  /** Choose a column's unit by its value as offered ("L/min", "s", "mL/kg/min"). */
  async setUnit(header: string, unit: string) {
    await this.row(header).getByTestId("unit-select").selectOption(unit);
  }

  async fill(name: string, value: string) {
    const field = this.page.getByTestId("column-form").locator(`[name="${name}"]`);
    if ((await field.evaluate((el) => el.tagName)) === "SELECT") await field.selectOption(value);
    else await field.fill(value);
  }

  async reread() {
    await this.page.getByTestId("reread").click();
  }

  async saveProfile(name: string) {
    await this.page.getByTestId("profile-name").fill(name);
    await this.page.getByTestId("save-profile").click();
  }
}

/** The extra inputs page (lactate, blood gases, spirometry, context, conduct). */
export class InputsPage {
  constructor(private readonly page: Page) {}

  async open(testId: number) {
    await this.page.goto(`/tests/${testId}/inputs`);
    await expect(this.page.getByTestId("inputs-title")).toBeVisible();
  }

  async uploadLactate(file: { name: string; content: string }, timeUnit: "s" | "min" = "s") {
    const form = this.page.getByTestId("lactate-form");
    await form
      .getByTestId("lactate-file")
      .setInputFiles({ name: file.name, mimeType: "text/csv", buffer: Buffer.from(file.content) });
    await form.locator('[name="timeUnit"]').selectOption(timeUnit);
    await form.getByTestId("lactate-submit").click();
  }
}

function escapeRegExp(s: string): string {
  return s.replace(/[.*+?^${}()|[\]\\]/g, "\\$&");
}
