import { execFileSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { CLINICAL_CAUTION } from "../../lib/report/caution";
import { renderReportPdf } from "../../lib/report/pdf/renderReportPdf";
import { exampleReportModel } from "./exampleReportModel";
import { analyse } from "../../lib/analysis";
import { buildReportModel } from "../../lib/report/buildReportModel";
import { initialDraftSections } from "../../lib/report/initialDraftSections";
import { toPdfText } from "../../lib/report/pdf/pdfText";
import type { ReportModel } from "../../lib/report/reportModel";
import { DEMO_CASES } from "../../lib/store/demoCases";
import { demoLabel, demoRecord } from "./demoRecord";

/** Every string of a (JSON-like) model. */
function strings(value: unknown, out: string[] = []): string[] {
  if (typeof value === "string") out.push(value);
  else if (Array.isArray(value)) value.forEach((v) => strings(v, out));
  else if (value && typeof value === "object") Object.values(value).forEach((v) => strings(v, out));
  return out;
}
const questionMarks = (text: string) => (text.match(/\?/g) ?? []).length;

/** The report model of an INVENTED demo case (synthetic generator preset, fixed seed), as a draft. */
async function demoModel(presetId: string): Promise<ReportModel> {
  const record = await demoRecord(presetId);
  const result = analyse(record);
  return buildReportModel(result, record, demoLabel(presetId), { status: "draft", sections: initialDraftSections(result) });
}

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

/** The text of the whole PDF with its line breaks (pdftotext, poppler), non-breaking spaces as spaces. */
function rawText(pdf: Buffer): string {
  requirePoppler();
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "cpet-report-"));
  const file = path.join(dir, "r.pdf");
  fs.writeFileSync(file, pdf);
  const text = execFileSync("pdftotext", [file, "-"])
    .toString()
    .replace(/\u00a0/g, " ");
  fs.rmSync(dir, { recursive: true, force: true });
  return text;
}

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
      // the header of every page qualifies the name: there is no log-in
      expect(text).toContain("Signed by Dr A Example (name as typed, not verified) on 2026-12-01 10:00 UTC");
      // and says when this copy was made (two copies of one signed version can differ in their version note)
      expect(text).toMatch(/PDF generated \d{4}-\d\d-\d\d \d\d:\d\d UTC/);
    }
    expect(pages.join(" ")).toContain("Signed by Dr A Example on 2026-12-01 10:00 UTC.");
  });

  it("a report signed while signed in names the account on every page instead of calling the name unverified", async () => {
    const model = exampleReportModel({ status: "signed", signedBy: "Dr A Example", signedAt, signerAccount: "aexample" });
    const pages = pagesText(await renderReportPdf(model));
    for (const text of pages) expect(text).toContain('Signed by Dr A Example (account "aexample") on 2026-12-01 10:00 UTC');
    const all = pages.join(" ");
    expect(all).not.toContain("not verified");
    expect(all).toContain('The signer was signed in as the account "aexample"');
  });

  it("prints values, sources with evidence status and the model's symbols as written", async () => {
    const all = pagesText(await renderReportPdf(exampleReportModel())).join(" ");
    // the embedded font has these glyphs: printed as themselves, not as ASCII stand-ins
    expect(all).toContain("Peak VO₂");
    expect(all).toContain("V-slope, ≥ 2 segments");
    expect(all).toContain("Δ between tests");
    expect(all).not.toContain(">=");
    expect(all).toContain("[3] Beaver WL, Wasserman K, Whipp BJ. J Appl Physiol 1986;60:2020-2027 - evidence: confirmed");
    // statuses in words, not as stored ("common-practice")
    expect(all).toContain("- evidence: common practice");
    expect(all).not.toContain("common-practice");
    expect(all).toContain("V-slope: VCO2 against VO2"); // chart title drawn from the SVG
  });

  it("draws every character of the demo reports: no glyph the embedded font lacks becomes '?'", async () => {
    // Every text of every demo report (values, path, schemes, methods, draft text, chart labels).
    for (const demo of DEMO_CASES) {
      const texts = strings(await demoModel(demo.presetId));
      for (const t of texts) expect([t, questionMarks(toPdfText(t))]).toEqual([t, questionMarks(t)]);
    }
  });

  it("a real draft PDF: '⇒' and the other symbols are drawn, the re-check note is printed, DRAFT and caution on every page", async () => {
    const model = await demoModel("ventilatory-limitation");
    const raw = strings(model).join(" ");
    expect(raw).toContain("⇒"); // the path outcome uses it
    expect(raw).toMatch(/[≥≤−·²]/);
    model.sections[model.sections.length - 1] = {
      ...model.sections[model.sections.length - 1],
      recheck: {
        fromVersion: 1,
        fromReportId: 1,
        reason: "Your text from report version 1 (draft) was kept, but it was written for an earlier analysis.",
        changes: ["VT1 (AT): 890 mL/min → 1100 mL/min"],
        generated: [],
      },
    };
    const pages = pagesText(await renderReportPdf(model));
    const all = pages.join(" ");
    // pdftotext shows "?" only where the model itself had one: no undrawable glyph was replaced.
    expect(questionMarks(all)).toBe(questionMarks(strings(model).join(" ")));
    expect(all).toContain("not assessable ->");
    expect(all).toContain("Re-check this text: Your text from report version 1 (draft) was kept");
    expect(all).toContain("VT1 (AT): 890 mL/min -> 1100 mL/min");
    expect(all).toContain("Peak RER > 1.05");
    // the model's symbols that the font has are printed as themselves
    for (const symbol of ["≥", "≤", "−", "·", "²"])
      if (raw.includes(symbol)) expect([symbol, all.includes(symbol)]).toEqual([symbol, true]);
    for (const text of pages) {
      expect(text).toContain("DRAFT - not signed");
      expect(text).toContain(CLINICAL_CAUTION);
    }
  });

  it("prints each classification scheme's notes as its data file words them", async () => {
    // the notes are the schemes' own limits (reference-equations/interpretation/schemes.json), e.g. that CPET rows alone
    // do not give a pulmonary-hypertension risk: the report's reader must see them as the page's does
    const file = JSON.parse(
      fs.readFileSync(path.join(__dirname, "../../reference-equations/interpretation/schemes.json"), "utf8"),
    ) as { schemes: { name: string; notes?: string[] }[] };
    const fromFile = new Map(file.schemes.map((s) => [s.name, s.notes ?? []]));
    let printed = 0;
    for (const preset of ["heart-failure", "pulmonary-vascular"]) {
      const model = await demoModel(preset);
      expect(model.schemes.length).toBeGreaterThan(0);
      for (const s of model.schemes) {
        expect([s.name, s.notes]).toEqual([s.name, fromFile.get(s.name)]);
        // one scheme at a time, signed (no DRAFT watermark), so no page break or watermark letter falls inside a note
        const one: ReportModel = {
          ...model,
          ...{ status: "signed", signedBy: "Dr A Example (invented)", signedAt },
          ...{ keyValues: [], thresholds: [], charts: [], path: [], sections: [], issues: [], methods: [], sources: [] },
          schemes: [s],
        };
        const text = pagesText(await renderReportPdf(one))[0];
        for (const note of s.notes ?? []) {
          expect(text).toContain(toPdfText(note).replace(/\s+/g, " "));
          printed++;
        }
      }
    }
    expect(printed).toBeGreaterThan(3);
  });

  it("keeps headers, arrows and 'not determinable' whole: no word split over two lines", async () => {
    const model = await demoModel("pulmonary-vascular");
    // INVENTED rows: every value column holds "not determinable", the longest value the report writes.
    for (const r of model.keyValues.slice(0, 3)) r.value = "not determinable";
    // The arrow at every position of a line: 60 change lines whose prefix grows by one character, so some
    // arrow falls at the right margin whatever the font metrics (by construction).
    model.sections[0] = {
      ...model.sections[0],
      recheck: {
        fromVersion: 1,
        fromReportId: 1,
        reason: "Invented note for the layout check.",
        changes: Array.from(
          { length: 60 },
          (_, i) => `${"x".repeat(i + 1)} VT1 (AT): 628 mL/min -> 582 mL/min -> 560 -> 540 -> 520`,
        ),
        generated: [],
      },
    };
    // Units at every position of a line in free text (issue messages), by construction as for the arrows.
    model.issues = [
      ...model.issues,
      ...Array.from({ length: 60 }, (_, i) => ({
        severity: "info" as const,
        code: "invented-layout-check",
        message: `${"y".repeat(i + 1)} VO2 1234 mL/min, 15.2 mL/kg/min, VE/VCO2 31.0, PETCO2 38 mmHg, 12.3 mL/beat`,
      })),
    ];
    const text = rawText(await renderReportPdf(model));
    expect(text).toMatch(/\bSources\b/);
    expect(text).not.toMatch(/Source\s*\n\s*s\b/);
    expect(text).not.toMatch(/-\s*\n\s*>/); // "-" ending one line and ">" starting the next
    expect(text).toContain("not determinable");
    expect(text).not.toMatch(/determin\s*\n\s*able/);
    expect(text).toContain("% pred.");
    expect(text).not.toMatch(/mL\/\s*\n\s*(kg\/)?min/); // one-word units stay whole
    expect(text).not.toMatch(/mL\/kg\/\s*\n\s*min|VE\/\s*\n\s*VCO2|mL\/\s*\n\s*beat/);
    expect(text.split("15.2 mL/kg/min").length - 1).toBeGreaterThanOrEqual(30);
    expect(text.split("628 mL/min -> 582 mL/min").length - 1).toBeGreaterThanOrEqual(30);
  });
});

/** pdffonts' table (poppler): one row per font with its name, type and whether it is embedded and subset. */
function pdfFonts(pdf: Buffer): { name: string; type: string; emb: string; sub: string; uni: string }[] {
  if (!hasTool("pdffonts")) throw new Error("pdffonts not found: install poppler-utils (e.g. apt-get install poppler-utils)");
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "cpet-report-"));
  const file = path.join(dir, "r.pdf");
  fs.writeFileSync(file, pdf);
  const lines = execFileSync("pdffonts", [file]).toString().trim().split("\n").slice(2);
  fs.rmSync(dir, { recursive: true, force: true });
  // name type(may hold spaces) encoding emb sub uni objectId gen: read the fixed tail from the right
  return lines.map((line) => {
    const cols = line.trim().split(/\s+/);
    const [emb, sub, uni] = cols.slice(-5, -2);
    return { name: cols[0], type: cols.slice(1, -6).join(" "), emb, sub, uni };
  });
}

describe("renderReportPdf with non-Western-European text", () => {
  // INVENTED names in Polish, Greek, Russian and Vietnamese (each language's own letters, typed as a person would)
  const NAMES = ["Łukasz Wójcik", "Ελένη Παπαδοπούλου", "Дмитрий Иванов", "Nguyễn Văn An", "Zoltán Kővári-Čermák"];

  it("prints names and text in Central European, Greek, Cyrillic and Vietnamese letters exactly as typed", async () => {
    for (const name of NAMES) {
      const model = exampleReportModel({
        status: "signed",
        signedBy: name,
        signedAt,
        title: `Exercise test report - ${name}`,
        sections: [{ id: "summary", title: `Résumé — ${name}`, paragraphs: [`Reviewed with ${name}: VO₂ ≥ 80 %.`] }],
      });
      const pages = pagesText(await renderReportPdf(model));
      const all = pages.join(" ");
      expect(all).toContain(`Signed by ${name} on 2026-12-01 10:00 UTC.`);
      expect(all).toContain(`Résumé — ${name}`);
      expect(all).toContain(`Reviewed with ${name}: VO₂ ≥ 80 %.`);
      for (const text of pages) expect(text).toContain(`Signed by ${name} (name as typed, not verified)`);
    }
  });

  it("a name typed with combining accents prints composed (NFC)", async () => {
    const decomposed = "Nguye\u0302\u0303n Va\u0306n An";
    const all = pagesText(await renderReportPdf(exampleReportModel({ status: "signed", signedBy: decomposed, signedAt }))).join(
      " ",
    );
    expect(all).toContain("Signed by Nguyễn Văn An on");
    expect(all).not.toContain("\u0302");
  });

  it("embeds subsets of the four Roboto faces it uses and no other font, charts included", async () => {
    const model = exampleReportModel({ status: "signed", signedBy: "Ελένη Παπαδοπούλου", signedAt });
    const fonts = pdfFonts(await renderReportPdf(model));
    expect(fonts.length).toBeGreaterThan(0);
    for (const f of fonts) {
      // a subset's name is six capital letters, "+", the font's PostScript name
      expect(f.name).toMatch(/^[A-Z]{6}\+Roboto-(Regular|Medium|Italic|MediumItalic)$/);
      expect([f.name, f.emb, f.sub, f.uni]).toEqual([f.name, "yes", "yes", "yes"]);
    }
    const faces = new Set(fonts.map((f) => f.name.slice(7)));
    expect(faces.has("Roboto-Regular") && faces.has("Roboto-Medium")).toBe(true);
    // the draft's watermark and the charts' bold titles draw with the same embedded faces
    const draftFonts = pdfFonts(await renderReportPdf(exampleReportModel()));
    for (const f of draftFonts) expect([f.name, f.emb]).toEqual([expect.stringMatching(/^[A-Z]{6}\+Roboto-/), "yes"]);
  });
});
