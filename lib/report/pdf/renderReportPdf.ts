import "server-only";
import path from "node:path";
import { EVIDENCE_LABEL } from "../../core";
import { displayUnit, formatUtcMinute } from "../../units";
import pdfmake from "pdfmake";
import type { Content, TableCell, TDocumentDefinitions } from "pdfmake/interfaces";
import { renderChartSvg } from "../charts/renderChartSvg";
import { signerIdentityNote } from "../caution";
import { EVIDENCE_LEGEND } from "../sources";
import type { ReportModel, ReportRow } from "../reportModel";
import { amendmentWords } from "../amendmentWords";
import { toPdfText } from "./pdfText";

/**
 * The embedded report font: Roboto as shipped with pdfmake, one file per face (Medium serves as bold). Located from
 * the working directory (the app and the tests run from the project root), which works whether or not the server
 * code is bundled. pdfkit embeds the subset of glyphs a PDF uses. What these files can print is `pdfText.ts`.
 * Licence: the files' name tables say SIL Open Font License 1.1 (Roboto 3.014, "The Roboto Project Authors"), which
 * allows embedding in documents; the files are not copied into this repository (test: `tests/report/pdfText.test.ts`).
 */
const FONT_DIR = path.join(process.cwd(), "node_modules", "pdfmake", "fonts", "Roboto");
const PDF_FONT_FILES = {
  normal: path.join(FONT_DIR, "Roboto-Regular.ttf"),
  bold: path.join(FONT_DIR, "Roboto-Medium.ttf"),
  italics: path.join(FONT_DIR, "Roboto-Italic.ttf"),
  bolditalics: path.join(FONT_DIR, "Roboto-MediumItalic.ttf"),
};
/** The family name the document and the chart SVG (`renderChartSvg`, font-family "Roboto, …") ask for. */
const FONT = "Roboto";

pdfmake.setFonts({ [FONT]: PDF_FONT_FILES });
pdfmake.setUrlAccessPolicy(() => false);
// only the four font files: no other local file can be pulled into a PDF
const fontFiles = new Set(Object.values(PDF_FONT_FILES));
pdfmake.setLocalAccessPolicy((p: string) => fontFiles.has(p));

/** A4 portrait content width with 40-pt side margins, pt. */
const CONTENT_WIDTH = 595.28 - 80;
const INK = "#1d232a";
const MUTED = "#5d6166";
const DRAFT_RED = "#a3241b";
const RULE = "#c9c3b6";

/** Map every string in a JSON-like value (the model is pure data) through `f`. */
function mapStrings<T>(value: T, f: (s: string) => string): T {
  if (typeof value === "string") return f(value) as T;
  if (Array.isArray(value)) return value.map((v) => mapStrings(v, f)) as T;
  if (value && typeof value === "object") {
    const out: Record<string, unknown> = {};
    for (const [k, v] of Object.entries(value)) out[k] = mapStrings(v, f);
    return out as T;
  }
  return value;
}

function formatSignedAt(iso: string | undefined): string {
  return iso ? formatUtcMinute(iso) : "";
}

/** Non-breaking space (U+00A0): keeps a short header or phrase on one line. */
const NBSP = "\u00a0";

/**
 * Tokens kept on one line: the arrow "->" (the line breaker would otherwise break after its hyphen) and short
 * slash-joined words — units and ratios such as mL/min, mL/kg/min, VE/VCO2 (it breaks after a slash too). Longer
 * slash-joined runs (addresses in the sources) may still wrap.
 */
const UNBREAKABLE = /->|[\p{L}\p{N}.%]+(?:\/[\p{L}\p{N}.%]+)+/gu;
const UNBREAKABLE_MAX_CHARS = 16;

/**
 * Keep tokens that must not be split over two lines in one piece: the arrow and short slash-joined
 * words (`UNBREAKABLE`) become unbreakable runs, and "not determinable" is joined by a non-breaking
 * space. Walks the document's text-bearing nodes only (text, stack, lists, columns, table bodies);
 * chart SVG and style keys are left alone.
 */
function keepTokensTogether(node: unknown): unknown {
  const split = (s: string): unknown => {
    const t = s.replace(/not determinable/g, `not${NBSP}determinable`);
    const out: unknown[] = [];
    let last = 0;
    for (const m of t.matchAll(UNBREAKABLE)) {
      if (m[0] !== "->" && m[0].length > UNBREAKABLE_MAX_CHARS) continue;
      if (m.index > last) out.push(t.slice(last, m.index));
      out.push({ text: m[0], noWrap: true });
      last = m.index + m[0].length;
    }
    if (out.length === 0) return t;
    if (last < t.length) out.push(t.slice(last));
    return { text: out };
  };
  if (typeof node === "string") return split(node);
  if (Array.isArray(node)) return node.map(keepTokensTogether);
  if (!node || typeof node !== "object") return node;
  const o = { ...(node as Record<string, unknown>) };
  if ("svg" in o) return o;
  if (typeof o.text === "string") {
    const t = split(o.text);
    o.text = typeof t === "string" ? t : (t as { text: unknown[] }).text;
  } else if (Array.isArray(o.text)) o.text = o.text.map(keepTokensTogether);
  for (const k of ["stack", "ul", "ol", "columns"]) if (Array.isArray(o[k])) o[k] = (o[k] as unknown[]).map(keepTokensTogether);
  if (o.table && typeof o.table === "object") {
    const table = { ...(o.table as Record<string, unknown>) };
    if (Array.isArray(table.body)) table.body = (table.body as unknown[][]).map((row) => row.map(keepTokensTogether));
    o.table = table;
  }
  return o;
}

const heading = (text: string): Content => ({ text, style: "h2", margin: [0, 14, 0, 6] });

const sourceRefs = (ids: string[], index: Map<string, number>): string =>
  ids
    .map((id) => index.get(id))
    .filter((n, i, all): n is number => n !== undefined && all.indexOf(n) === i)
    .map((n) => `[${n}]`)
    .join(" ");

function valuesTable(rows: ReportRow[], index: Map<string, number>): Content {
  const head = ["Measure", "Value", "Unit", "Predicted", `%${NBSP}pred.`, "LLN", "Method", "Sources"].map((t): TableCell => ({
    text: t,
    style: "th",
  }));
  const body: TableCell[][] = [head];
  for (const r of rows) {
    body.push([
      { text: r.label, bold: true },
      // Numbers and one-word units ("mL/min", "mL/kg/min") never wrap (a line may break after "/").
      { text: r.value, alignment: "right", noWrap: true },
      { text: displayUnit(r.unit), noWrap: !/\s/.test(displayUnit(r.unit)) },
      { text: r.predicted ?? "", alignment: "right", noWrap: true },
      { text: r.pctPredicted ?? "", alignment: "right", noWrap: true },
      { text: r.lln ?? "", alignment: "right", noWrap: true },
      { stack: [{ text: r.method, color: MUTED }, ...(r.note ? [{ text: r.note, color: MUTED, fontSize: 7.5 }] : [])] },
      { text: sourceRefs(r.sourceIds, index), color: MUTED },
    ]);
  }
  return {
    // Number, unit and source columns as wide as their widest header or cell ("auto": pdfmake measures the
    // longest unbreakable word), so no header or value is split inside a word; the method column takes the rest.
    table: { headerRows: 1, widths: [78, "auto", "auto", "auto", "auto", "auto", "*", "auto"], body },
    // Light horizontal rules with narrow cell padding, so the method column keeps its width.
    layout: {
      hLineWidth: (i, node) => (i === 0 || i === node.table.body.length ? 0 : i === 1 ? 1 : 0.5),
      vLineWidth: () => 0,
      hLineColor: (i) => (i === 1 ? "#000000" : "#aaaaaa"),
      paddingLeft: (i) => (i === 0 ? 0 : 3),
      paddingRight: () => 3,
    },
    fontSize: 8.5,
  };
}

/** The amendment block of the first page: the version replaced, the signer's reason, the values that differ. */
function amendmentContent(model: ReportModel): Content | null {
  const words = amendmentWords(model);
  if (!words) return null;
  const lines: Content[] = [{ text: [{ text: words.heading, bold: true }, words.reason ? ` ${words.reason}` : ""] }];
  if (words.changesIntro)
    lines.push(
      words.lines.length
        ? {
            stack: [
              { text: words.changesIntro, margin: [0, 2, 0, 1] },
              { ul: words.lines.map((l) => ({ text: l })), fontSize: 8.5 },
            ],
          }
        : { text: words.changesIntro, margin: [0, 2, 0, 0] },
    );
  return {
    table: { widths: ["*"], body: [[{ stack: lines, margin: [4, 3, 4, 3] }]] },
    layout: { hLineColor: () => MUTED, vLineColor: () => MUTED, hLineWidth: () => 0.8, vLineWidth: () => 0.8 },
    margin: [0, 8, 0, 0],
  };
}

/**
 * Write the report as a PDF (A4, embedded Roboto subsets) with pdfmake.
 *
 * Every page carries the clinical caution and page number in its footer; while the report is not
 * signed every page also carries a DRAFT watermark and the draft caution in its header. Charts are
 * the same SVG the page shows (`renderChartSvg`), its text drawn in the same embedded font. All text goes through
 * `toPdfText` first: what the font has prints as typed (Latin, Greek, Cyrillic), arrows and the few other symbols it
 * lacks get a stand-in ("->"); characters with neither are refused before signing (`unprintableInPdf`).
 * Sections: identification, key values, thresholds, charts, interpretation path, schemes, report
 * text, data-quality issues, methods, sources (numbered, with evidence status), signature.
 *
 * @returns the PDF bytes (starts with "%PDF").
 */
export async function renderReportPdf(rawModel: ReportModel, now: Date = new Date()): Promise<Buffer> {
  // when this copy was made: two PDFs of one signed version can differ in their version note, and this orders them
  const generatedAt = formatUtcMinute(now.toISOString());
  const model = mapStrings(rawModel, toPdfText);
  const draft = model.status !== "signed";
  // a signed report that a newer signed version amends says so in red on every page
  const amended = !draft && /^Version \d+ of \d+\..*Superseded:/.test(model.versionNote ?? "");
  const index = new Map(model.sources.map((s, i) => [s.id, i + 1]));
  const statusLine = draft
    ? "DRAFT - not signed"
    : `Signed by ${model.signedBy ?? "(unknown)"} (${model.signerAccount ? `account "${model.signerAccount}"` : "name as typed, not verified"}) on ${formatSignedAt(model.signedAt)}`;

  const content: Content[] = [
    { text: model.title, style: "h1" },
    { text: model.patientLine, margin: [0, 2, 0, 0] },
    { text: model.testLine },
    { text: `Referral question: ${model.referral}` },
    { text: `Analysis engine version ${model.engineVersion}`, color: MUTED, fontSize: 8 },
  ];
  if (draft) {
    content.push({
      table: { widths: ["*"], body: [[{ text: model.draftMark, bold: true, color: DRAFT_RED, margin: [4, 3, 4, 3] }]] },
      layout: {
        hLineColor: () => DRAFT_RED,
        vLineColor: () => DRAFT_RED,
        hLineWidth: () => 1.2,
        vLineWidth: () => 1.2,
      },
      margin: [0, 8, 0, 0],
    });
  }

  // an amendment says, on its first page, why it replaces the signed version and which reported values differ
  const amendmentBlock = amendmentContent(model);
  if (amendmentBlock) content.push(amendmentBlock);

  content.push(heading("Key values"));
  content.push(model.keyValues.length ? valuesTable(model.keyValues, index) : { text: "No values available.", color: MUTED });
  content.push(heading("Thresholds"));
  content.push(
    model.thresholds.length
      ? valuesTable(model.thresholds, index)
      : { text: "No thresholds in this version of the analysis.", color: MUTED },
  );

  if (model.charts.length) {
    content.push(heading("Charts"));
    for (const spec of model.charts) {
      content.push({
        svg: renderChartSvg(spec, { width: CONTENT_WIDTH, height: 270, maxPointsPerSeries: 500 }),
        width: CONTENT_WIDTH,
        margin: [0, 4, 0, 10],
        font: FONT,
      } as Content);
    }
  }

  content.push(heading("Interpretation path"));
  if (model.path.length) {
    const body: TableCell[][] = [
      ["Step", "Variable", "Value", "Cut-off", "Outcome", "Sources"].map((t): TableCell => ({ text: t, style: "th" })),
      ...model.path.map((p): TableCell[] => [
        String(p.step),
        p.variable,
        p.value,
        p.cutoff,
        p.outcome,
        { text: sourceRefs(p.sourceIds, index), color: MUTED },
      ]),
    ];
    content.push({
      table: { headerRows: 1, widths: ["auto", 90, 70, 80, "*", "auto"], body },
      layout: "lightHorizontalLines",
      fontSize: 8.5,
    });
  } else content.push({ text: "No interpretation path in this version of the analysis.", color: MUTED });

  content.push(heading("Classification schemes"));
  if (model.schemes.length) {
    const body: TableCell[][] = [
      ["Scheme", "Category", "Severity", "Inputs and notes", "Sources"].map((t): TableCell => ({ text: t, style: "th" })),
      ...model.schemes.map((s): TableCell[] => [
        { text: s.name, bold: true },
        s.category,
        String(s.severity),
        s.notes?.length
          ? { stack: [s.inputs.join("; "), { text: `Note: ${s.notes.join(" ")}`, color: MUTED, margin: [0, 2, 0, 0] }] }
          : s.inputs.join("; "),
        { text: sourceRefs(s.sourceIds, index), color: MUTED },
      ]),
    ];
    content.push({
      table: { headerRows: 1, widths: [100, 90, "auto", "*", "auto"], body },
      layout: "lightHorizontalLines",
      fontSize: 8.5,
    });
  } else content.push({ text: "No classification scheme in this version of the analysis.", color: MUTED });

  content.push(heading(draft ? "Report text (draft)" : "Report text"));
  for (const section of model.sections) {
    content.push({ text: section.title, style: "h3", margin: [0, 6, 0, 2] });
    if (section.recheck) {
      content.push({
        stack: [
          { text: `Re-check this text: ${section.recheck.reason}`, bold: true },
          ...(section.recheck.changes.length ? [{ ul: section.recheck.changes }] : []),
        ],
        color: DRAFT_RED,
        fontSize: 8.5,
        margin: [0, 0, 0, 4],
      });
    }
    for (const p of section.paragraphs) content.push({ text: p, margin: [0, 0, 0, 4] });
  }

  content.push(heading("Data quality"));
  content.push(
    model.issues.length
      ? {
          ul: model.issues.map((i) => ({
            // the message only: its code ("record-selected") is for the software, not for the clinician reading
            text: [{ text: `${i.severity}: `, bold: true }, i.message],
          })),
          fontSize: 8.5,
        }
      : { text: "No problems were found.", color: MUTED },
  );

  if (model.methods.length) {
    content.push(heading("Methods"));
    content.push({ ul: model.methods, fontSize: 8.5 });
  }
  content.push(heading("Sources"));
  content.push({ text: toPdfText(EVIDENCE_LEGEND), color: MUTED, fontSize: 8, margin: [0, 0, 0, 4] });
  content.push(
    model.sources.length
      ? {
          stack: model.sources.map((s, i) => ({
            text: [`[${i + 1}] ${s.citation}`, { text: ` - evidence: ${EVIDENCE_LABEL[s.status]}`, color: MUTED }],
            margin: [0, 0, 0, 2],
          })),
          fontSize: 8,
        }
      : { text: "No sources cited.", color: MUTED },
  );

  content.push(heading("Signature"));
  content.push(
    draft
      ? { text: "Not signed.", bold: true, color: DRAFT_RED }
      : {
          stack: [
            { text: `Signed by ${model.signedBy ?? "(unknown)"} on ${formatSignedAt(model.signedAt)}.`, bold: true },
            ...(model.attestation
              ? [{ text: `The signer confirmed: "${model.attestation}"`, margin: [0, 2, 0, 0] } as Content]
              : []),
            { text: toPdfText(signerIdentityNote(model.signerAccount)), color: MUTED, fontSize: 8 },
          ],
        },
  );

  const doc: TDocumentDefinitions = {
    pageSize: "A4",
    // room for the header: title and status, the version note, and the draft mark (up to three lines); the note's
    // lines estimated at 120 characters of 7.5-pt Roboto across the 515-pt text width, 9.5 pt each (our choice: the
    // product's notes measure 137-160 characters per line in Regular and Medium, a line of only Greek or Cyrillic
    // names about 124)
    pageMargins: [40, (draft ? 74 : 54) + (model.versionNote ? 4 + 9.5 * Math.ceil(model.versionNote.length / 120) : 0), 40, 52],
    info: { title: model.title, creator: "cpet-desk", subject: draft ? "Draft CPET report" : "Signed CPET report" },
    // Roboto's line box (ascender to descender, 1.17 em) is 27 % taller than Helvetica's (0.925 em): 0.95 gives 1.11 em
    // lines, near the former 1.06 em, and keeps the demo reports' page counts (our choice)
    defaultStyle: { font: FONT, fontSize: 9.5, color: INK, lineHeight: 0.95 },
    styles: {
      h1: { fontSize: 16, bold: true, margin: [0, 0, 0, 4] },
      h2: { fontSize: 11.5, bold: true },
      h3: { fontSize: 10, bold: true },
      th: { bold: true, color: MUTED, fontSize: 8 },
    },
    ...(draft ? { watermark: { text: "DRAFT", color: DRAFT_RED, opacity: 0.1, bold: true, fontSize: 120 } } : {}),
    header: (): Content => ({
      margin: [40, 18, 40, 0],
      stack: [
        {
          columns: [
            { text: model.title, fontSize: 8.5, color: MUTED, width: "*" },
            { text: statusLine, width: "auto", fontSize: 8.5, bold: true, alignment: "right", color: draft ? DRAFT_RED : INK },
          ],
        },
        { canvas: [{ type: "line", x1: 0, y1: 3, x2: CONTENT_WIDTH, y2: 3, lineWidth: 0.5, lineColor: RULE }] },
        ...(model.versionNote
          ? [
              {
                text: model.versionNote,
                fontSize: 7.5,
                color: amended ? DRAFT_RED : MUTED,
                bold: amended,
                margin: [0, 3, 0, 0],
              } as Content,
            ]
          : []),
        ...(draft
          ? [{ text: model.draftMark, fontSize: 8.5, bold: true, color: DRAFT_RED, margin: [0, 4, 0, 0] } as Content]
          : []),
      ],
    }),
    footer: (currentPage: number, pageCount: number): Content => ({
      margin: [40, 8, 40, 0],
      stack: [
        { canvas: [{ type: "line", x1: 0, y1: 0, x2: CONTENT_WIDTH, y2: 0, lineWidth: 0.5, lineColor: RULE }] },
        { text: model.caution, fontSize: 7.5, color: INK, margin: [0, 3, 0, 0] },
        {
          columns: [
            { text: `cpet-desk, engine ${model.engineVersion}; PDF generated ${generatedAt}`, fontSize: 7, color: MUTED },
            { text: `Page ${currentPage} of ${pageCount}`, fontSize: 7, color: MUTED, alignment: "right" },
          ],
        },
      ],
    }),
    content: keepTokensTogether(content) as Content[],
  };
  return pdfmake.createPdf(doc).getBuffer();
}
