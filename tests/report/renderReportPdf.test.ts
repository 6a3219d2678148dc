import { execFileSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { CLINICAL_CAUTION } from "../../lib/report/caution";
import { renderReportPdf } from "../../lib/report/pdf/renderReportPdf";
import { exampleReportModel } from "./exampleReportModel";

function hasTool(name: string): boolean {
  try {
    execFileSync("sh", ["-c", `command -v ${name}`]);
    return true;
  } catch {
    return false;
  }
}

/**
 * The page-text checks need pdftotext and pdfinfo from poppler-utils (CI installs it). They always run: without
 * the tools they fail with this message rather than vanish.
 */
function requirePoppler(): void {
  const missing = ["pdftotext", "pdfinfo"].filter((t) => !hasTool(t));
  if (missing.length > 0)
    throw new Error(
      `${missing.join(" and ")} not found: install poppler-utils (e.g. apt-get install poppler-utils) to run the PDF text checks`,
    );
}

/** Text of each page (pdftotext, poppler), whitespace collapsed. */
function pagesText(pdf: Buffer): string[] {
  requirePoppler();
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "cpet-report-"));
  const file = path.join(dir, "r.pdf");
  fs.writeFileSync(file, pdf);
  const pages = Number(/Pages:\s+(\d+)/.exec(execFileSync("pdfinfo", [file]).toString())?.[1]);
  const out: string[] = [];
  for (let p = 1; p <= pages; p++) {
    out.push(
      execFileSync("pdftotext", ["-f", String(p), "-l", String(p), file, "-"])
        .toString()
        .replace(/\s+/g, " "),
    );
  }
  fs.rmSync(dir, { recursive: true, force: true });
  return out;
}

const signedAt = "2026-12-01T10:00:00.000Z";

describe("renderReportPdf", () => {
  it("writes a PDF", async () => {
    const pdf = await renderReportPdf(exampleReportModel());
    expect(pdf.subarray(0, 5).toString("latin1")).toBe("%PDF-");
    // Two charts of 121 points each: far below the few-hundred-KB budget.
    expect(pdf.byteLength).toBeLessThan(300_000);
  });

  it("a draft carries the DRAFT mark and the clinical caution on every page", async () => {
    const model = exampleReportModel();
    // Long text forces several pages.
    model.sections.push({
      id: "long",
      title: "Long",
      paragraphs: Array.from({ length: 60 }, (_, i) => `Paragraph ${i + 1} of invented filler text.`),
    });
    const pages = pagesText(await renderReportPdf(model));
    expect(pages.length).toBeGreaterThanOrEqual(3);
    for (const text of pages) {
      expect(text).toContain("DRAFT - not signed");
      expect(text).toContain("not a final report until it has been reviewed and signed");
      expect(text).toContain(CLINICAL_CAUTION);
    }
    expect(pages.join(" ")).toContain("Not signed.");
  });

  it("a signed report has no DRAFT mark, keeps the caution and shows the signer", async () => {
    const pages = pagesText(await renderReportPdf(exampleReportModel({ status: "signed", signedBy: "Dr A Example", signedAt })));
    for (const text of pages) {
      expect(text).not.toMatch(/DRAFT/);
      expect(text).toContain(CLINICAL_CAUTION);
      expect(text).toContain("Signed by Dr A Example on 2026-12-01 10:00 UTC");
    }
  });

  it("prints values, sources with evidence status and sanitised symbols", async () => {
    const all = pagesText(await renderReportPdf(exampleReportModel())).join(" ");
    expect(all).toContain("Peak VO2"); // "VO₂" sanitised
    expect(all).toContain(">= 80 %"); // "≥" sanitised
    expect(all).toContain("[3] Beaver WL, Wasserman K, Whipp BJ. J Appl Physiol 1986;60:2020-2027 - evidence: confirmed");
    expect(all).toContain("V-slope: VCO2 against VO2"); // chart title drawn from the SVG
    expect(all).not.toContain("₂");
  });
});
