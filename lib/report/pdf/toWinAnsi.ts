/**
 * The characters beyond ASCII that the PDF standard fonts (Helvetica, WinAnsiEncoding = Windows code
 * page 1252) can draw: Latin-1 0xA0-0xFF plus the cp1252 extras in 0x80-0x9F.
 */
const CP1252_EXTRAS = "€‚ƒ„…†‡ˆ‰Š‹ŒŽ‘’“”•–—˜™š›œžŸ";

/** Whether one character (one code point) is drawable with WinAnsiEncoding. */
export function isWinAnsi(char: string): boolean {
  const code = char.codePointAt(0) ?? 0;
  if (code === 0x0a || code === 0x09) return true;
  if (code >= 0x20 && code <= 0x7e) return true;
  if (code >= 0xa0 && code <= 0xff) return true;
  return CP1252_EXTRAS.includes(char);
}

/** Readable ASCII stand-ins for characters the product's texts use that WinAnsi lacks. */
const REPLACEMENTS: Record<string, string> = {
  "≥": ">=",
  "≤": "<=",
  "≠": "!=",
  "≈": "~",
  "⩾": ">=",
  "⩽": "<=",
  "→": "->",
  "←": "<-",
  "⇒": "->",
  "⇐": "<-",
  "↔": "<->",
  "⇔": "<->",
  "∆": "delta",
  "∙": "·",
  "∗": "*",
  "⁄": "/",
  "∕": "/",
  "‒": "-",
  "―": "—",
  "↑": "up",
  "↓": "down",
  "−": "-",
  "‐": "-",
  "‑": "-",
  "′": "'",
  "″": '"',
  "√": "sqrt",
  "∞": "infinity",
  "⋅": "·",
  Δ: "delta",
  δ: "delta",
  α: "alpha",
  β: "beta",
  γ: "gamma",
  λ: "lambda",
  σ: "sigma",
  τ: "tau",
  μ: "µ",
  "\u2009": " ",
  "\u200a": " ",
  "\u202f": " ",
  "\u2002": " ",
  "\u2003": " ",
  "\u200b": "",
  "✓": "yes",
  "✗": "no",
  "✔": "yes",
  "✘": "no",
};

/** Latin letters with a stroke or bar, which NFKD does not split into letter and mark (names: Łucja, Đorđe). */
const STROKED_LETTERS: Record<string, string> = { Ł: "L", ł: "l", Đ: "D", đ: "d", Ħ: "H", ħ: "h", ı: "i", Ŧ: "T", ŧ: "t" };

const SUBSCRIPT_DIGITS = "₀₁₂₃₄₅₆₇₈₉";
const SUPERSCRIPT_DIGITS = "⁰¹²³⁴⁵⁶⁷⁸⁹";

/**
 * Make text drawable with the PDF standard fonts (WinAnsi only): subscript digits become digits
 * ("VO₂" → "VO2"), superscripts outside Latin-1 become "^n", named symbols become ASCII words or
 * operators ("≥" → ">=", "Δ" → "delta"), accented letters outside cp1252 lose their accent
 * (NFKD), and anything else becomes "?". Characters WinAnsi has (é, °, ±, µ, ², —, –, …) are kept.
 */
export function toWinAnsi(text: string): string {
  let out = "";
  // composed first (NFC): a letter typed as base + combining accent prints as the accented letter
  const chars = [...text.normalize("NFC")];
  chars.forEach((ch, i) => {
    if (isWinAnsi(ch)) {
      out += ch;
      return;
    }
    const sub = SUBSCRIPT_DIGITS.indexOf(ch);
    if (sub >= 0) {
      out += String(sub);
      return;
    }
    const sup = SUPERSCRIPT_DIGITS.indexOf(ch);
    if (sup >= 0) {
      out += `^${sup}`;
      return;
    }
    if (ch in REPLACEMENTS) {
      const word = REPLACEMENTS[ch];
      out += word;
      // A symbol replaced by a word must not glue to what follows ("ΔVO2" → "delta VO2").
      if (word.length > 1 && /[a-z]$/i.test(word) && /^[\p{L}\p{N}]/u.test(chars[i + 1] ?? "")) out += " ";
      return;
    }
    if (ch in STROKED_LETTERS) {
      out += STROKED_LETTERS[ch];
      return;
    }
    const stripped = ch.normalize("NFKD").replace(/[\u0300-\u036f]/g, "");
    out += [...stripped].every(isWinAnsi) && stripped.length > 0 ? stripped : "?";
  });
  return out;
}

/**
 * The characters of `text` that the PDF cannot show at all (they would print as "?"): scripts and symbols outside the
 * Western European set and the replacements above, such as Chinese characters or emoji. Each listed once, in order.
 */
export function unprintableInPdf(text: string): string[] {
  const out: string[] = [];
  // composed first (NFC): "e" + combining accent is one printable letter, not an accent on its own
  for (const ch of text.normalize("NFC")) if (toWinAnsi(ch) === "?" && ch !== "?" && !out.includes(ch)) out.push(ch);
  return out;
}

/** A character as a message names it: itself, or its code point when it has no visible shape (U+200D, U+0301). */
export function describeChar(ch: string): string {
  const invisible = /[\p{M}\p{Cf}\p{Zs}\p{Cc}]/u.test(ch);
  return invisible ? `U+${ch.codePointAt(0)!.toString(16).toUpperCase().padStart(4, "0")}` : ch;
}
