/**
 * What the report PDF can print. The PDF embeds Roboto (Regular, Medium, Italic, MediumItalic; the copies shipped
 * with pdfmake), so it prints the characters those fonts have a glyph for: Latin including Central European and
 * Vietnamese letters, Greek, Cyrillic, and common punctuation, maths and currency signs. This module is plain data
 * and string code (no font file is read here), so the upload schema, the sign form and the PDF writer can all use it.
 */

/**
 * Code points that ALL FOUR Roboto faces map to a real glyph (the intersection of their cmaps, glyph 0 left out),
 * as hexadecimal ranges. A copy of the font files' own data: `tests/report/pdfText.test.ts` reads the cmaps of the
 * files in node_modules and fails when this list and the fonts differ (e.g. after a pdfmake upgrade).
 */
export const PDF_FONT_COVERAGE =
  "0000 0002 000D 0020-007E 00A0-017F 018F 0192 01A0-01A1 01AF-01B0 01F0 01FA-01FF 0218-021B 0237 0259 02BC " +
  "02C6-02C7 02C9 02D8-02DD 02F3 0300-0301 0303 0309 030F 0323 0384-038A 038C 038E-03A1 03A3-03CE 03D1-03D2 03D6 " +
  "0400-0486 0488-0513 1E00-1E01 1E3E-1E3F 1E80-1E85 1E9E 1EA0-1EF9 1F4D 2000-200B 2010-2011 2013-2015 2017-201E " +
  "2020-2022 2025-2027 2030 2032-2033 2039-203A 203C 2044 2070 2074-208E 20A3-20A4 20A6-20AC 20B1 20B9-20BA " +
  "20BC-20BD 20C1 2105 2113 2116 2122 2126 212E 215B-215E 2202 2206 220F 2211-2212 221A 221E 222B 2248 2260 " +
  "2264-2265 25A0 25CA-25CB 25CF EE01-EE02 F6C3 FB01-FB04 FEFF FFFC-FFFD";

/** `PDF_FONT_COVERAGE` as sorted [first, last] code point pairs. */
export const PDF_FONT_RANGES: readonly (readonly [number, number])[] = PDF_FONT_COVERAGE.split(" ").map((r) => {
  const [a, b = a] = r.split("-");
  return [parseInt(a, 16), parseInt(b, 16)] as const;
});

/** Whether all four embedded faces have a glyph for this code point (binary search in `PDF_FONT_RANGES`). */
export function inPdfFont(codePoint: number): boolean {
  let lo = 0;
  let hi = PDF_FONT_RANGES.length - 1;
  while (lo <= hi) {
    const mid = (lo + hi) >> 1;
    const [a, b] = PDF_FONT_RANGES[mid];
    if (codePoint < a) hi = mid - 1;
    else if (codePoint > b) lo = mid + 1;
    else return true;
  }
  return false;
}

/**
 * Characters never printed as typed even when the font maps them (our choice): control characters, format
 * characters (zero-width joiners, soft hyphen, byte-order mark), private-use and unassigned code points, and
 * combining marks left over after NFC composition (a mark the font would place on its own, unchecked), and line or
 * paragraph separators.
 */
const NOT_PRINTED = /[\p{Cc}\p{Cf}\p{Co}\p{Cn}\p{Cs}\p{M}\p{Zl}\p{Zp}]/u;

/** In words, what the PDF prints: for messages that refuse a character. */
export const PDF_PRINTABLE_WORDS = "Latin (including Central European and Vietnamese), Greek and Cyrillic letters";

/** Whether one character (one code point) prints as itself in the report PDF. Line feed and tab are layout. */
export function isPrintableInPdf(char: string): boolean {
  if (char === "\n" || char === "\t") return true;
  return inPdfFont(char.codePointAt(0) ?? -1) && !NOT_PRINTED.test(char);
}

/**
 * Readable stand-ins for characters the product's texts (or a reader's) use that the embedded font lacks, and for
 * invisible characters that are dropped. Only characters `isPrintableInPdf` rejects belong here (the unit test
 * checks it), and every stand-in prints.
 */
const REPLACEMENTS: Record<string, string> = {
  "⩾": "≥",
  "⩽": "≤",
  "→": "->",
  "←": "<-",
  "⇒": "->",
  "⇐": "<-",
  "↔": "<->",
  "⇔": "<->",
  "∙": "·",
  "⋅": "·",
  "∗": "*",
  "∕": "/",
  "‒": "–",
  "↑": "up",
  "↓": "down",
  "\u202f": "\u00a0",
  "\u200b": "",
  "\u00ad": "",
  "✓": "yes",
  "✗": "no",
  "✔": "yes",
  "✘": "no",
};

/**
 * Make text printable with the embedded font. Text is composed first (NFC), so a letter typed as base letter plus
 * combining accent prints as the accented letter. Every character the font has is kept as typed (Łódź, Ελένη,
 * Дмитрий, Nguyễn, VO₂, ≥, Δ, −). Characters it lacks become a readable stand-in ("→" → "->", "✓" → "yes"), or,
 * for letters with marks outside the font, the letter without its marks (NFKD, e.g. "ǎ" → "a"); anything else
 * becomes "?" (`unprintableInPdf` lists those, and the app refuses them before they reach a PDF).
 */
export function toPdfText(text: string): string {
  let out = "";
  const chars = [...text.normalize("NFC")];
  chars.forEach((ch, i) => {
    if (isPrintableInPdf(ch)) {
      out += ch;
      return;
    }
    if (ch in REPLACEMENTS) {
      const word = REPLACEMENTS[ch];
      out += word;
      // A symbol replaced by a word must not glue to what follows ("✓ok" → "yes ok").
      if (word.length > 1 && /[a-z]$/i.test(word) && /^[\p{L}\p{N}]/u.test(chars[i + 1] ?? "")) out += " ";
      return;
    }
    const stripped = ch.normalize("NFKD").replace(/\p{M}/gu, "");
    out += stripped.length > 0 && [...stripped].every(isPrintableInPdf) ? stripped : "?";
  });
  return out;
}

/**
 * The characters of `text` that the PDF cannot show at all (they would print as "?"): characters the embedded font
 * lacks with no stand-in, such as Chinese characters or emoji, and invisible ones such as U+200D. Each listed once,
 * in order.
 */
export function unprintableInPdf(text: string): string[] {
  const out: string[] = [];
  // composed first (NFC): "e" + combining accent is one printable letter, not an accent on its own
  for (const ch of text.normalize("NFC")) if (toPdfText(ch) === "?" && ch !== "?" && !out.includes(ch)) out.push(ch);
  return out;
}

/** A character as a message names it: itself, or its code point when it has no visible shape (U+200D, U+0301). */
export function describeChar(ch: string): string {
  const invisible = /[\p{M}\p{Cf}\p{Zs}\p{Cc}]/u.test(ch);
  return invisible ? `U+${ch.codePointAt(0)!.toString(16).toUpperCase().padStart(4, "0")}` : ch;
}
