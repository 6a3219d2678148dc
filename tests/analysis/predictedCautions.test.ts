/**
 * A patient outside a predicted-value equation's derivation population: the equation's caution reaches the analysis'
 * issues (the page's and the report's list), not only the CLI. The 16-year-old is an INVENTED change to the invented
 * normal-adult demo case; the derivation ranges are those the equation files give (ERS 2019 HRmax for cycle ergometry,
 * 20–80 y — Radtke et al. 2019, confirmed; Hansen, Sue & Wasserman 1984 peak VO2 — secondary).
 */
import { describe, expect, it } from "vitest";
import { analyse } from "../../lib/analysis";
import { buildReportModel } from "../../lib/report/buildReportModel";
import { demoRecord } from "../report/demoRecord";

describe("predicted values for a patient outside the equations' derivation ranges (invented)", async () => {
  const adult = await demoRecord("normal-adult");
  const teen = { ...adult, patient: { ...adult.patient, ageY: 16 } };
  const result = analyse(teen, { bootstrap: 0 });

  it("every predicted value's extrapolation caution is in the analysis' issues, once, as a warning", () => {
    const own = Object.values(result.predicted.values).flatMap((pv) => pv?.issues ?? []);
    const outside = own.filter((i) => /outside the derivation range/.test(i.message));
    expect(outside.length).toBeGreaterThan(0);
    for (const i of outside) {
      const found = result.issues.filter((x) => x.message === i.message);
      expect(found, i.message).toHaveLength(1);
      expect(found[0].severity).not.toBe("error");
    }
    expect(result.issues.some((i) => /age 16 y is outside the derivation range 20–80 y/.test(i.message))).toBe(true);
  });

  it("the report model carries them too, and an adult within every range gets none", () => {
    const model = buildReportModel(result, teen, "Teen (invented)", { status: "draft", sections: [] });
    expect(JSON.stringify(model)).toMatch(/outside the derivation range/);
    expect(analyse(adult, { bootstrap: 0 }).issues.some((i) => /outside the derivation range/.test(i.message))).toBe(false);
  });
});
