import { describe, expect, it } from "vitest";
import { importBreathFile } from "../../lib/breath";

describe("a column mostly outside its plausible range", () => {
  it("is set aside whole: its few in-range values are in the same wrong unit (INVENTED per-kg VCO2 under a plain header)", async () => {
    // VCO2 per kg 4.0 … 37.2 mL/kg/min written without a unit: read as mL/min, 30–37 lies inside 30–10 000 mL/min
    // (PLAUSIBLE_RANGE, common practice) but 4–29 does not, so most of the column is out of range
    const lines = ["time_s,vo2_ml_min,VCO2"];
    for (let i = 0; i < 120; i++) lines.push(`${5 * i},${400 + 20 * i},${((0.9 * (400 + 20 * i)) / 75).toFixed(1)}`);
    const r = await importBreathFile(new TextEncoder().encode(lines.join("\n")));
    const note = r.issues.find((i) => i.code === "column-mostly-implausible")!;
    expect(note.message).toMatch(/the whole column was set aside/);
    expect(r.table!.rows.every((x) => x.vco2MlMin === undefined)).toBe(true);
    expect(r.table!.rows.filter((x) => x.vo2MlMin !== undefined)).toHaveLength(120);
  });
});
