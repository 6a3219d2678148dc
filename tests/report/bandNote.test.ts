import { describe, expect, it } from "vitest";
import { measured, notDetermined } from "../../lib/core";
import { bandNote } from "../../lib/report";
import type { LineIndex } from "../../lib/thresholds";

// Invented lines; the words are ours.
const prov = (inputs: Record<string, number> = {}) => ({ method: "m", label: "l", sourceIds: [], inputs });
function line(value: number, band: { low: number; high: number } | null, inputs: Record<string, number> = {}): LineIndex {
  return {
    slope: measured(value, "1", prov(inputs)),
    intercept: measured(1, "L/min", prov(inputs)),
    r2: measured(0.9, "1", prov(inputs)),
    n: 100,
    band,
  };
}

describe("band note", () => {
  it("writes the band at the value's precision, with the corrected slope when the band is centred on one", () => {
    expect(bandNote(line(39.8, { low: 39.24, high: 46.52 }, { dilutionCorrected: 42.88 }), 1)).toBe(
      "band 39.2–46.5; corrected for breath noise 42.9",
    );
    expect(bandNote(line(7.6, { low: 7.24, high: 7.97 }), 1)).toBe("band 7.2–8.0");
  });

  it("says so when the band is narrower than the last digit, and nothing without a band or a value", () => {
    expect(bandNote(line(28.01, { low: 28.0, high: 28.02 }), 1)).toBe("band narrower than the last digit shown");
    expect(bandNote(line(28, null), 1)).toBe("");
    expect(bandNote(undefined, 1)).toBe("");
    const nd: LineIndex = { ...line(1, { low: 0, high: 2 }), slope: notDetermined("1", prov(), "too few points") };
    expect(bandNote(nd, 1)).toBe("");
  });
});
