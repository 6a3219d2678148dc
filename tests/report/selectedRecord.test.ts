/**
 * One test kept from a file holding several: which one is named beside the file on the page and in the report's test
 * line. Data: ACTES (Chabert C, Mongin D, Hermand E, Collado A, Hue O. Cardiorespiratory measurement from graded
 * cycloergometer exercise testing, version 1.0.0. PhysioNet; 2022. https://doi.org/10.13026/2qs3-kh43. ODC-By 1.0), whose
 * measure file holds 18 tests keyed by ID.
 */
import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { analyse, buildRecord } from "../../lib/analysis";
import { buildReportModel } from "../../lib/report/buildReportModel";

describe("the selected record of a multi-test file", () => {
  it("is kept with the upload and named in the report's test line", async () => {
    const bytes = new Uint8Array(readFileSync(new URL("../fixtures/open-data/actes/actes_test_measure.csv", import.meta.url)));
    const built = await buildRecord({
      bytes,
      fileName: "actes_test_measure.csv",
      patient: { sex: "male", ageY: 30, heightCm: 180, weightKg: 75 }, // INVENTED details
      ergometer: "cycle",
      importOptions: { select: { ID: "13" } },
    });
    expect(built.record!.upload!.selected).toBe("ID = 13");
    const model = buildReportModel(analyse(built.record!, { bootstrap: 0 }), built.record!, "INVENTED label", {
      status: "draft",
      sections: [],
    });
    expect(model.testLine).toContain("the test where ID = 13 in a file holding several");
    // a file of one test (the INVENTED normal-adult demo) says nothing of the kind
    const one = new Uint8Array(readFileSync(new URL("../fixtures/cases/normal-adult.csv", import.meta.url)));
    const single = await buildRecord({ bytes: one, fileName: "normal-adult.csv", patient: {}, ergometer: "cycle" });
    expect(single.record).not.toBeNull();
    expect(single.record!.upload!.selected).toBeUndefined();
    expect(
      buildReportModel(analyse(single.record!, { bootstrap: 0 }), single.record!, "x", { status: "draft", sections: [] })
        .testLine,
    ).not.toContain("holding several");
  });
});
