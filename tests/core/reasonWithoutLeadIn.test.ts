import { describe, it, expect } from "vitest";
import { reasonWithoutLeadIn } from "../../lib/core";

describe("reasonWithoutLeadIn", () => {
  it("drops the lead-in a 'not available' text already says, and keeps the rest word for word", () => {
    expect(reasonWithoutLeadIn("not determinable: only 4 bins of VE and VCO2 (need 9)")).toBe(
      "only 4 bins of VE and VCO2 (need 9)",
    );
    expect(reasonWithoutLeadIn("Not determined no work rate")).toBe("no work rate");
    expect(reasonWithoutLeadIn("not assessable: effort inadequate")).toBe("effort inadequate");
    expect(reasonWithoutLeadIn("no spirometry (MVV or FEV1) given")).toBe("no spirometry (MVV or FEV1) given");
  });
  it("no reason, or a lead-in alone, is no reason", () => {
    expect(reasonWithoutLeadIn(undefined)).toBeNull();
    expect(reasonWithoutLeadIn("not determinable:")).toBeNull();
    expect(reasonWithoutLeadIn("  ")).toBeNull();
  });
});
