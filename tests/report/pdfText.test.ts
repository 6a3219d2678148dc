import { createRequire } from "node:module";
import path from "node:path";
import { describe, expect, it } from "vitest";
import {
  PDF_FONT_COVERAGE,
  PDF_FONT_RANGES,
  describeChar,
  inPdfFont,
  isPrintableInPdf,
  toPdfText,
  unprintableInPdf,
} from "../../lib/report/pdf/pdfText";

/** The part of fontkit's font object this test reads (fontkit ships no types). */
interface FontkitFont {
  postscriptName: string;
  name: { records: Record<string, Record<string, string> | undefined> };
  characterSet: number[];
  glyphForCodePoint(codePoint: number): { id: number };
}
const fontkit = createRequire(import.meta.url)("fontkit") as { openSync(file: string): FontkitFont };

/** The four faces the PDF embeds, read from the files pdfmake ships (the same files the PDF writer loads). */
const FACES = ["Regular", "Medium", "Italic", "MediumItalic"].map((face) =>
  fontkit.openSync(path.join(process.cwd(), "node_modules/pdfmake/fonts/Roboto", `Roboto-${face}.ttf`)),
);

/** Code points every face maps to a glyph other than glyph 0 (.notdef), from the font files' cmaps. */
function fontsCoverage(): number[] {
  return FACES[0].characterSet.filter((cp) => FACES.every((f) => f.glyphForCodePoint(cp).id !== 0)).sort((a, b) => a - b);
}

/** Sorted code points as the table writes them: "0020-007E 00A0 …" (hexadecimal, runs joined). */
function asRanges(codePoints: number[]): string {
  const runs: [number, number][] = [];
  for (const cp of codePoints) {
    const last = runs[runs.length - 1];
    if (last && last[1] === cp - 1) last[1] = cp;
    else runs.push([cp, cp]);
  }
  const hex = (n: number) => n.toString(16).toUpperCase().padStart(4, "0");
  return runs.map(([a, b]) => (a === b ? hex(a) : `${hex(a)}-${hex(b)}`)).join(" ");
}

const tableCodePoints = (): number[] => PDF_FONT_RANGES.flatMap(([a, b]) => Array.from({ length: b - a + 1 }, (_, i) => a + i));

describe("the embedded font's licence", () => {
  // The fonts are not in this repository; pdfmake's package brings them, and each PDF embeds a subset. The font files'
  // own name tables (record 13, licence description) say which licence that is: SIL Open Font License 1.1, which allows
  // embedding in documents. A pdfmake update that ships fonts under another licence fails here and must be read first.
  it("is the SIL Open Font License 1.1 in all four faces, as their name tables say", () => {
    for (const face of FACES) {
      expect(face.name.records.license?.en, face.postscriptName).toMatch(/SIL Open Font License, Version 1\.1/);
      expect(face.name.records.copyright?.en, face.postscriptName).toMatch(/The Roboto Project Authors/);
    }
  });
});

describe("the checked coverage table", () => {
  it("is exactly what all four embedded Roboto faces map (their cmaps, read with fontkit)", () => {
    expect(FACES.map((f) => f.postscriptName)).toEqual([
      "Roboto-Regular",
      "Roboto-Medium",
      "Roboto-Italic",
      "Roboto-MediumItalic",
    ]);
    // on failure after a font update, the expected value is the new table to copy into PDF_FONT_COVERAGE
    expect(PDF_FONT_COVERAGE).toBe(asRanges(fontsCoverage()));
    // and the parsed table holds the same code points
    expect(tableCodePoints()).toEqual(fontsCoverage());
  });
  it("ranges are sorted and apart (the binary search relies on it)", () => {
    for (let i = 1; i < PDF_FONT_RANGES.length; i++) expect(PDF_FONT_RANGES[i][0]).toBeGreaterThan(PDF_FONT_RANGES[i - 1][1] + 1);
    for (const cp of fontsCoverage()) expect(inPdfFont(cp)).toBe(true);
    expect(inPdfFont(0x5fc3)).toBe(false); // 心
  });
});

// Alphabets as written in each language (outside facts, not our output): every letter must print as itself.
const ALPHABETS = {
  polish: "AĄBCĆDEĘFGHIJKLŁMNŃOÓPRSŚTUWYZŹŻ aąbcćdeęfghijklłmnńoóprsśtuwyzźż",
  czech: "AÁBCČDĎEÉĚFGHIÍJKLMNŇOÓPQRŘSŠTŤUÚŮVWXYÝZŽ aábcčdďeéěfghiíjklmnňoópqrřsštťuúůvwxyýzž",
  hungarian: "AÁBCDEÉFGHIÍJKLMNOÓÖŐPQRSTUÚÜŰVWXYZ aábcdeéfghiíjklmnoóöőpqrstuúüűvwxyz",
  romanian: "ĂÂÎȘȚ ăâîșț",
  greek: "ΑΒΓΔΕΖΗΘΙΚΛΜΝΞΟΠΡΣΤΥΦΧΨΩ αβγδεζηθικλμνξοπρσςτυφχψω άέήίόύώΆΈΉΊΌΎΏϊϋΐΰ",
  russian: "АБВГДЕЁЖЗИЙКЛМНОПРСТУФХЦЧШЩЪЫЬЭЮЯ абвгдеёжзийклмнопрстуфхцчшщъыьэюя",
  ukrainianSerbian: "ҐЄІЇ ґєії ЂЈЉЊЋЏ ђјљњћџ",
  vietnamese: "ĂÂĐÊÔƠƯ ăâđêôơư ảạấầẩẫậắằẳẵặẻẽẹếềểễệỉịỏọốồổỗộớờởỡợủụứừửữựỳỵỷỹ",
};

describe("toPdfText", () => {
  it("keeps Central European, Greek, Cyrillic and Vietnamese letters as typed", () => {
    for (const [language, letters] of Object.entries(ALPHABETS)) {
      expect([language, toPdfText(letters)]).toEqual([language, letters]);
      expect([language, unprintableInPdf(letters)]).toEqual([language, []]);
    }
    for (const name of ["Łukasz Wójcik", "Ελένη Παπαδοπούλου", "Дмитрий Иванов", "Nguyễn Văn An", "Łódź", "Đorđe"])
      expect(toPdfText(name)).toBe(name);
  });
  it("keeps the product's own symbols the font has: subscripts, superscripts, ≥ ≤ Δ −", () => {
    const kept = "VO₂ ≥ 80 % and VE/VCO₂ ≤ 34, ΔVO2/ΔWR, −5, 10⁵, μmol, ≠ ≈ √ ∞ ∆";
    expect(toPdfText(kept)).toBe(kept);
  });
  it("keeps what the former Western European set had", () => {
    const kept = "Dyspnée — 12 °C ± 2 µ ² ³ – … ‘q’ “q” € ™ • ·";
    expect(toPdfText(kept)).toBe(kept);
    for (const ch of kept) expect(isPrintableInPdf(ch)).toBe(true);
  });
  it("writes a stand-in for symbols the font lacks: arrows, check marks", () => {
    // Roboto has no arrows (U+2190-21FF are absent from its cmap, checked above)
    expect(toPdfText("−5 → 3")).toBe("−5 -> 3");
    expect(toPdfText("not assessable ⇒ next step")).toBe("not assessable -> next step");
    expect(toPdfText("✓ok")).toBe("yes ok");
    expect(toPdfText("a\u202Fb")).toBe("a\u00a0b");
    expect(toPdfText("a\u200Bb")).toBe("ab");
  });
  it("a letter with marks outside the font loses its marks; anything else becomes ?", () => {
    expect(inPdfFont(0x01ce)).toBe(false); // ǎ (pinyin third tone)
    expect(toPdfText("Lǎo")).toBe("Lao");
    expect(toPdfText("心")).toBe("?");
    // what would print as "?" is listed (the sign action refuses it), each character once
    expect(unprintableInPdf("Łódź 心 心 ? 😀")).toEqual(["心", "😀"]);
    expect(unprintableInPdf("李明 Ελένη")).toEqual(["李", "明"]);
    // a name typed decomposed (e + U+0301) is composed first: printable, and printed with its accent
    expect(unprintableInPdf("Jose\u0301")).toEqual([]);
    expect(toPdfText("Jose\u0301")).toBe("José");
    expect(toPdfText("Nguye\u0302\u0303n")).toBe("Nguyễn");
    // a mark with no letter to compose with is refused, named by its code point
    expect(unprintableInPdf("x\u0301").map(describeChar)).toEqual(["U+0301"]);
  });
  it("refuses invisible and control characters even where the font maps them", () => {
    // U+FEFF and U+0000 are in Roboto's cmap, but print nothing a reader sees
    expect(inPdfFont(0xfeff) && inPdfFont(0)).toBe(true);
    expect(unprintableInPdf("a\u200Db\uFEFFc\u0000").map(describeChar)).toEqual(["U+200D", "U+FEFF", "U+0000"]);
    expect(describeChar("心")).toBe("心");
    // private-use glyphs of the font are not text
    expect(isPrintableInPdf("\uEE01")).toBe(false);
  });
  it("stand-ins exist only for characters the font lacks, and print themselves", () => {
    const symbols = "⩾⩽→←⇒⇐↔⇔∙⋅∗∕‒↑↓✓✗✔✘\u202f\u200b\u00ad";
    for (const ch of symbols) {
      expect([ch, isPrintableInPdf(ch)]).toEqual([ch, false]);
      for (const out of toPdfText(ch)) expect([ch, isPrintableInPdf(out)]).toEqual([ch, true]);
    }
  });
  it("output is always printable or ?", () => {
    const mixed = "VO₂ ≥ ≠ ≈ √ ∞ ★ 😀 Ω α β → 心 \u200D ǎ ｆｕｌｌ";
    for (const ch of toPdfText(mixed)) expect([ch, ch === "?" || isPrintableInPdf(ch)]).toEqual([ch, true]);
  });
});
