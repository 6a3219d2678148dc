import { describe, expect, it } from "vitest";
import { describeChar, isWinAnsi, toWinAnsi, unprintableInPdf } from "../../lib/report/pdf/toWinAnsi";

// WinAnsiEncoding = Windows code page 1252 (PDF 1.7 reference, Annex D; common practice):
// ASCII, Latin-1 0xA0-0xFF and the cp1252 extras such as — – … ‘ ’ “ ” € ™ •.
describe("toWinAnsi", () => {
  it("turns subscripts and symbols Helvetica cannot draw into readable ASCII", () => {
    expect(toWinAnsi("VO₂ ≥ 80 % and VE/VCO₂ ≤ 34")).toBe("VO2 >= 80 % and VE/VCO2 <= 34");
    expect(toWinAnsi("Δ VO2")).toBe("delta VO2");
    expect(toWinAnsi("ΔVO2/ΔWR")).toBe("delta VO2/delta WR");
    expect(toWinAnsi("−5 → 3")).toBe("-5 -> 3");
    expect(toWinAnsi("10⁵")).toBe("10^5");
    expect(toWinAnsi("μmol")).toBe("µmol");
  });
  it("keeps what WinAnsi has", () => {
    const kept = "Dyspnée — 12 °C ± 2 µ ² ³ – … ‘q’ “q” € ™ • ·";
    expect(toWinAnsi(kept)).toBe(kept);
    for (const ch of kept) expect(isWinAnsi(ch)).toBe(true);
  });
  it("strips accents outside cp1252 and replaces anything else with ?", () => {
    // Ł has no Unicode decomposition: written as L (a letter with a stroke); ó is Latin-1, kept; ź → z
    expect(toWinAnsi("Łódź")).toBe("Lódz");
    expect(toWinAnsi("心")).toBe("?");
    // what would print as "?" is listed (the sign action refuses it), each character once
    expect(unprintableInPdf("Łódź 心 心 ? 😀")).toEqual(["心", "😀"]);
    // a name typed decomposed (e + U+0301) is composed first: printable, and printed with its accent
    expect(unprintableInPdf("Jose\u0301")).toEqual([]);
    expect(toWinAnsi("Jose\u0301")).toBe("José");
    // a character with no visible shape is named by its code point
    expect(unprintableInPdf("a\u200Db").map(describeChar)).toEqual(["U+200D"]);
    expect(describeChar("心")).toBe("心");
    expect(toWinAnsi("a\u202Fb")).toBe("a b");
  });
  it("output is always WinAnsi", () => {
    const mixed = "VO₂ ≥ ≠ ≈ √ ∞ ★ 😀 Ω α β";
    for (const ch of toWinAnsi(mixed)) expect(isWinAnsi(ch)).toBe(true);
  });
});
