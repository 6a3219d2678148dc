/**
 * Thousands separators in exports from comma-decimal locales (INVENTED values, known by construction): "1.087,7" is
 * 1087.7 and "1.187" is 1187 in a file whose decimal mark is the comma; "1,087.7" is 1087.7 with a decimal dot; a space
 * (plain, no-break or narrow no-break) groups thousands in either convention. Before this was read, every VO2 of
 * 1000 mL/min or more of such a file was dropped and the peak fell from 2609 to 971 mL/min.
 */
import { describe, expect, it } from "vitest";
import { importBreathFile } from "../../lib/breath";
import { parseNumberCell } from "../../lib/breath/parseCell";

describe("thousands separators", () => {
  it.each([
    ["1.087,7", ",", 1087.7],
    ["1.187", ",", 1187],
    ["12.345.678,5", ",", 12345678.5],
    ["491,868", ",", 491.868],
    ["1,087.7", ".", 1087.7],
    ["1 087,7", ",", 1087.7],
    ["1\u00a0087.7", ".", 1087.7],
    ["1\u202f087", ",", 1087],
    ["-1.000,5", ",", -1000.5],
  ] as const)("%s with decimal mark %s → %s", (text, mark, value) => {
    expect(parseNumberCell(text, mark)).toBeCloseTo(value, 9);
  });

  it.each([
    ["1.08,7", ","],
    ["10.87", ","], // a dot in a comma-decimal file groups exactly three digits
    ["1,08.7", "."],
    ["1 08,7", ","],
  ] as const)("%s with decimal mark %s is not a number", (text, mark) => {
    expect(parseNumberCell(text, mark)).toBeNaN();
  });

  it("a semicolon file with decimal commas and dot thousands keeps every VO2 above 1000 mL/min", async () => {
    const lines = ["Zeit;VO2 (mL/min);VCO2 (mL/min);HF"];
    for (let i = 0; i < 120; i++) {
      const vo2 = 400 + 20 * i + 0.5; // 400.5 … 2780.5 mL/min
      const vco2 = 0.9 * vo2;
      const de = (x: number) => x.toLocaleString("de-DE", { minimumFractionDigits: 1, maximumFractionDigits: 1 });
      lines.push(`${5 * i};${de(vo2)};${de(vco2)};${80 + i}`);
    }
    expect(lines[61]).toContain("1.600,5;1.440,5"); // the layout under test
    const r = await importBreathFile(new TextEncoder().encode(lines.join("\n")));
    expect(r.format?.decimalMark).toBe(",");
    expect(r.issues.map((i) => i.code)).not.toContain("not-a-number");
    expect(r.table!.rows.map((x) => x.vo2MlMin)).toEqual(
      Array.from({ length: 120 }, (_, i) => expect.closeTo(400.5 + 20 * i, 6)),
    );
  });
});
