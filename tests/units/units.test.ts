import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { fromCanonical, toCanonical, UNIT_CONVERSIONS, type QuantityId } from "../../lib/units";

describe("lib/units conversions", () => {
  it("property: every unit round-trips to canonical and back (relative error < 1e-12)", () => {
    const pairs = (Object.keys(UNIT_CONVERSIONS) as QuantityId[]).flatMap((q) =>
      Object.keys(UNIT_CONVERSIONS[q]).map((u) => [q, u] as const),
    );
    fc.assert(
      fc.property(fc.constantFrom(...pairs), fc.double({ min: -1e6, max: 1e6, noNaN: true }), ([q, u], x) => {
        const back = fromCanonical(q, toCanonical(q, x, u), u);
        expect(Math.abs(back - x)).toBeLessThanOrEqual(1e-12 * Math.max(1, Math.abs(x)));
      }),
    );
  });

  it("worked values (definitions, common practice)", () => {
    expect(toCanonical("vo2", 2.5, "L/min")).toBe(2500); // 1 L = 1000 mL
    expect(toCanonical("petco2", 5.3, "kPa")).toBeCloseTo(39.753, 3); // 5.3 × 7.50062
    expect(toCanonical("work", 612, "kpm/min")).toBeCloseTo(100, 10); // 612 / 6.12
    expect(toCanonical("speed", 1, "mph")).toBeCloseTo(1.609344, 12);
    expect(toCanonical("time", 2.5, "min")).toBe(150);
    expect(() => toCanonical("vo2", 1, "furlong")).toThrow(/unknown unit/);
  });
});
