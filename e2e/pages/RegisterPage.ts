import type { Page } from "@playwright/test";

/** Page object for the test register (home) and its upload form. */
export class RegisterPage {
  constructor(private readonly page: Page) {}

  async open() {
    await this.page.goto("/");
  }

  async upload(file: { name: string; content: string | Buffer }, details: Record<string, string> = {}) {
    const form = this.page.getByTestId("upload-form");
    await this.page.getByTestId("upload-file").setInputFiles({
      name: file.name,
      mimeType: "text/csv",
      buffer: Buffer.isBuffer(file.content) ? file.content : Buffer.from(file.content),
    });
    for (const [name, value] of Object.entries(details)) {
      const field = form.locator(`[name="${name}"]`);
      if ((await field.evaluate((el) => el.tagName)) === "SELECT") await field.selectOption(value);
      else await field.fill(value);
    }
    await this.page.getByTestId("upload-submit").click();
  }
}
