import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { BREATH_ISSUE_CODES, importBreathFile, type ImportResult } from "../../lib/breath";

// INVENTED SYNTHETIC DATA: small hand-written files, each broken in one known way.
const enc = (s: string) => new TextEncoder().encode(s);
const codes = (r: ImportResult) => r.issues.map((i) => i.code);

/** A clean plain-convention file: 30 breaths 3 s apart, VO2 rising 300 → 1750 mL/min. */
function plain(rows = 30, vo2 = (i: number) => 300 + 50 * i): string[] {
  const lines = ["time_s,vo2_ml_min,vco2_ml_min,ve_l_min"];
  for (let i = 0; i < rows; i++)
    lines.push(`${i * 3},${vo2(i)},${(vo2(i) * 0.9).toFixed(1)},${((vo2(i) * 0.9 * 30) / 1000).toFixed(2)}`);
  return lines;
}

describe("broken files give a clear issue and never throw", () => {
  it("empty file", async () => {
    const r = await importBreathFile(new Uint8Array());
    expect(r.table).toBeNull();
    expect(codes(r)).toEqual(["empty-file"]);
    expect((await importBreathFile(enc("\n \r\n"))).issues[0].code).toBe("empty-file");
  });

  it("binary file", async () => {
    const bytes = new Uint8Array(256).map((_, i) => i);
    const r = await importBreathFile(bytes);
    expect(r.table).toBeNull();
    expect(codes(r)).toEqual(["binary-file"]);
    expect(r.issues[0].message).toMatch(/CSV/);
  });

  it("a ZIP that is not a workbook, and an old .xls", async () => {
    const zip = await importBreathFile(new Uint8Array([0x50, 0x4b, 0x03, 0x04, 1, 2, 3, 4, 5]));
    expect(codes(zip)).toEqual(["xlsx-unreadable"]);
    const xls = await importBreathFile(new Uint8Array([0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1]));
    expect(codes(xls)).toEqual(["legacy-xls"]);
  });

  it("header only", async () => {
    const r = await importBreathFile(enc("time_s,vo2_ml_min,vco2_ml_min\n"));
    expect(r.table).toBeNull();
    expect(codes(r)).toEqual(["header-only"]);
  });

  it("no time column", async () => {
    const r = await importBreathFile(
      enc(
        plain()
          .map((l) => l.split(",").slice(1).join(","))
          .join("\n"),
      ),
    );
    expect(r.table).toBeNull();
    expect(codes(r)).toContain("no-time-column");
    expect(r.issues.find((i) => i.code === "no-time-column")?.message).toMatch(/time_s/);
  });

  it("no VO2 column", async () => {
    const r = await importBreathFile(
      enc(
        plain()
          .map((l) =>
            l
              .split(",")
              .filter((_, j) => j !== 1)
              .join(","),
          )
          .join("\n"),
      ),
    );
    expect(r.table).toBeNull();
    expect(codes(r)).toContain("no-vo2-column");
  });

  it("VO2 in the wrong unit: header says mL/min, values are L/min", async () => {
    const r = await importBreathFile(enc(plain(30, (i) => 0.3 + 0.05 * i).join("\n")));
    const issue = r.issues.find((i) => i.code === "unit-mismatch" && i.where?.column === "vo2_ml_min");
    expect(issue?.message).toBe("VO2 values look like L/min, not mL/min as the plain column name says; read as L/min.");
    // 0.3 L/min → 300 mL/min
    expect(r.table!.rows[0].vo2MlMin).toBeCloseTo(300, 6);
  });

  it("time goes backwards (two records joined)", async () => {
    const lines = plain(30);
    const second = plain(15).slice(1);
    const r = await importBreathFile(enc([...lines, ...second].join("\n")));
    expect(r.table).toBeNull();
    const issue = r.issues.find((i) => i.code === "time-goes-backwards")!;
    expect(issue.severity).toBe("error");
    // 30 data rows occupy lines 2–31; the restart is on line 32
    expect(issue.where?.row).toBe(32);
    expect(issue.message).toMatch(/^Time goes backwards at row 32/);
  });

  it("a single row out of time order is set aside with a warning", async () => {
    const lines = plain(30);
    lines[10] = lines[10].replace(/^\d+/, "5"); // line 11 (time 27 s) now says 5 s
    const r = await importBreathFile(enc(lines.join("\n")));
    expect(r.table!.rows.length).toBe(29);
    expect(r.issues.find((i) => i.code === "time-glitch")?.where?.row).toBe(11);
  });

  it("duplicated time stamps", async () => {
    const lines = plain(30);
    const doubled = [lines[0], ...lines.slice(1).flatMap((l) => [l, l])];
    const r = await importBreathFile(enc(doubled.join("\n")));
    expect(r.table!.rows.length).toBe(30);
    const issue = r.issues.find((i) => i.code === "duplicate-time")!;
    expect(issue.message).toMatch(/^30 row/);
    expect(issue.where?.row).toBe(3);
  });

  it("one column of text", async () => {
    const lines = plain(30).map((l, i) => (i === 0 ? `${l},hr_bpm` : `${l},high`));
    const r = await importBreathFile(enc(lines.join("\n")));
    expect(r.table).not.toBeNull();
    expect(r.issues.find((i) => i.code === "column-not-numeric")?.where?.column).toBe("hr_bpm");
    expect(r.table!.fields).not.toContain("hrBpm");
  });

  it("a column headed Stage that names phases is read as the phase, and a Stage column of other text is still set aside", async () => {
    // by construction: breaths 0-9 rest, 10-24 exercise, 25-29 recovery
    const name = (i: number) => (i < 10 ? "Rest" : i < 25 ? "Exercise" : "Recovery");
    const phased = plain(30).map((l, i) => (i === 0 ? `${l},Stage` : `${l},${name(i - 1)}`));
    const r = await importBreathFile(enc(phased.join("\n")));
    expect(codes(r)).toContain("stage-column-read-as-phase");
    expect(codes(r)).not.toContain("column-not-numeric");
    expect(r.table!.rows.map((row) => row.phase)).toEqual(Array.from({ length: 30 }, (_, i) => name(i).toLowerCase()));
    const other = plain(30).map((l, i) => (i === 0 ? `${l},Stage` : `${l},level ${i > 15 ? "B" : "A"}`));
    const r2 = await importBreathFile(enc(other.join("\n")));
    expect(r2.issues.find((i) => i.code === "column-not-numeric")?.where?.column).toBe("Stage");
    expect(r2.table!.rows.every((row) => row.phase === undefined)).toBe(true);
  });

  it("a few text cells in a numeric column", async () => {
    const lines = plain(30);
    lines[5] = lines[5].replace(/,[^,]+,/, ",err,");
    const r = await importBreathFile(enc(lines.join("\n")));
    expect(r.issues.find((i) => i.code === "not-a-number")?.where).toEqual({ column: "vo2_ml_min", row: 6 });
  });

  it("implausible values in proportion: one isolated breath is an info line, more than 1 % of the breaths a warning", async () => {
    // 400 breaths of a steady invented ramp (VO2 300 + 5·i mL/min); limits 50–8000 mL/min (PLAUSIBLE_RANGE)
    const one = plain(400, (i) => 300 + 5 * i);
    one[100] = one[100].replace(/^(\d+),[^,]+/, "$1,20"); // one swallow-like breath at VO2 20 mL/min
    const a = (await importBreathFile(enc(one.join("\n")))).issues.find((i) => i.code === "implausible-values");
    expect(a?.severity).toBe("info");
    expect(a?.message).toMatch(/^1 isolated VO2 value\(s\) lie outside 50–8000 mL\/min/);
    const many = plain(400, (i) => 300 + 5 * i);
    for (const k of [50, 90, 130, 170, 210, 250]) many[k] = many[k].replace(/^(\d+),[^,]+/, "$1,20"); // 6 > 1 % of 400
    const b = (await importBreathFile(enc(many.join("\n")))).issues.find((i) => i.code === "implausible-values");
    expect(b?.severity).toBe("warning");
    expect(b?.message).toMatch(/^6 VO2 value\(s\) lie outside/);
  });

  it("gaps, implausible values, too few rows", async () => {
    const lines = plain(30);
    lines[20] = lines[20].replace(/^\d+/, "200"); // a 143-s gap before line 21, then rows continue from 60 s… make the rest later
    const shifted = lines.map((l, i) => (i > 20 ? l.replace(/^\d+/, String(200 + (i - 20) * 3)) : l));
    shifted[3] = shifted[3].replace(/^(\d+),\d+/, "$1,99999");
    const r = await importBreathFile(enc(shifted.join("\n")));
    expect(r.issues.find((i) => i.code === "time-gap")?.where?.row).toBe(21);
    expect(r.issues.find((i) => i.code === "implausible-values")?.where?.row).toBe(4);
    const few = await importBreathFile(enc(plain(5).join("\n")));
    expect(codes(few)).toContain("too-few-rows");
    expect(few.table).toBeNull();
  });

  it("every issue code raised is a registered, kebab-case code", async () => {
    const r = await importBreathFile(enc(plain(30, (i) => 0.3 + 0.05 * i).join("\n")));
    for (const i of r.issues) {
      expect(i.code).toMatch(/^[a-z0-9]+(-[a-z0-9]+)*$/);
      expect(Object.keys(BREATH_ISSUE_CODES)).toContain(i.code);
    }
  });

  it("property: no byte sequence makes the importer throw (it resolves with issues)", async () => {
    await fc.assert(
      fc.asyncProperty(fc.uint8Array({ maxLength: 600 }), async (bytes) => {
        const r = await importBreathFile(bytes);
        expect(Array.isArray(r.issues)).toBe(true);
        if (r.table === null) expect(r.issues.some((i) => i.severity === "error")).toBe(true);
      }),
      { numRuns: 300 },
    );
  });

  it("property: any text built from table-like pieces resolves without throwing", async () => {
    const piece = fc.constantFrom(
      "time_s",
      "VO2",
      "vo2_ml_min",
      "t",
      "1",
      "2,5",
      "0.3",
      "-",
      '"',
      ";",
      ",",
      "\t",
      "\n",
      "12:30",
      "rest",
      "",
      " ",
      "NaN",
      "1e309",
      "Weight: 70 kg\n",
    );
    await fc.assert(
      fc.asyncProperty(fc.array(piece, { maxLength: 200 }), async (parts) => {
        const r = await importBreathFile(enc(parts.join("")));
        expect(Array.isArray(r.issues)).toBe(true);
        for (const row of r.table?.rows ?? []) expect(Number.isFinite(row.timeS)).toBe(true);
      }),
      { numRuns: 300 },
    );
  });
});
