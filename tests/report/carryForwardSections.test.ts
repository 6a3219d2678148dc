import { describe, expect, it } from "vitest";
import { carryForwardSections } from "../../lib/report/carryForwardSections";
import { describeValueChanges } from "../../lib/report/describeValueChanges";
import type { ReportRow, ReportSection } from "../../lib/report/reportModel";

// INVENTED report texts and values (synthetic; not patient data).
const s = (id: string, title: string, ...paragraphs: string[]): ReportSection => ({ id, title, paragraphs });
const freeze = <T>(x: T): T => JSON.parse(JSON.stringify(x), (_k, v) => (typeof v === "object" && v ? Object.freeze(v) : v));

const generatedBefore = freeze([
  s("results", "Results", "Peak VO2 1284 mL/min."),
  s("thresholds", "Thresholds", "VT1 at VO2 890 mL/min."),
  s("conclusion", "Conclusion", "Reduced capacity."),
  s("old-only", "Old section", "Generated only before."),
]);
const generatedAfter = freeze([
  s("results", "Results", "Peak VO2 1284 mL/min."),
  s("thresholds", "Thresholds", "VT1 at VO2 1100 mL/min."),
  s("conclusion", "Conclusion", "Reduced capacity; VT1 not low."),
]);

describe("carryForwardSections", () => {
  it("keeps the reviewer's edited sections with a re-check note and takes new generated text elsewhere", () => {
    const previous = freeze({
      reportId: 7,
      version: 2,
      status: "signed" as const,
      sections: [
        s("results", "Results", "Peak VO2 1284 mL/min."), // unchanged from generated
        s("thresholds", "Thresholds", "VT1  at VO2 890 mL/min.  "), // whitespace only: not an edit
        s("conclusion", "Conclusion", "My own conclusion: reduced capacity, VT1 890 mL/min."),
        s("old-only", "Old section", "My note in a section the new analysis no longer writes."),
      ],
    });
    const changes = ["VT1 (AT): 890 mL/min → 1100 mL/min"];
    const out = carryForwardSections({ previous, previousGenerated: generatedBefore, nextGenerated: generatedAfter, changes });
    expect(out.sections.map((x) => x.id)).toEqual(["results", "thresholds", "conclusion", "old-only"]);
    expect(out.sections[0]).toEqual(generatedAfter[0]);
    expect(out.sections[1]).toEqual(generatedAfter[1]); // not edited: the new numbers' text
    const conclusion = out.sections[2];
    expect(conclusion.paragraphs).toEqual(["My own conclusion: reduced capacity, VT1 890 mL/min."]);
    expect(conclusion.recheck).toMatchObject({
      fromVersion: 2,
      fromReportId: 7,
      // How the section's generated text changed comes first (the conclusion matters most), then the values.
      changes: [
        "Generated text no longer says: “Reduced capacity.”",
        "Generated text now says: “Reduced capacity; VT1 not low.”",
        ...changes,
      ],
      generated: ["Reduced capacity; VT1 not low."],
    });
    expect(conclusion.recheck!.reason).toMatch(/version 2 \(signed\).*numbers changed.*re-check/);
    expect(out.sections[3].recheck!.reason).toMatch(/no longer part of the generated report/);
    expect(out.carried).toEqual(["Conclusion", "Old section"]);
  });

  it("is never silent: a carried section has a note even when no displayed value changed", () => {
    const previous = { reportId: 3, version: 1, status: "draft" as const, sections: [s("conclusion", "Conclusion", "Edited.")] };
    // Same generated text before and after: only the settings changed.
    const out = carryForwardSections({
      previous,
      previousGenerated: generatedAfter,
      nextGenerated: generatedAfter,
      changes: [],
    });
    const c = out.sections.find((x) => x.id === "conclusion")!;
    expect(c.paragraphs).toEqual(["Edited."]);
    expect(c.recheck!.changes).toEqual([]);
    expect(c.recheck!.reason).toMatch(/no reported value changed/);
  });

  it("carries an unresolved note forward and merges its list of changes", () => {
    const previous = {
      reportId: 9,
      version: 3,
      status: "draft" as const,
      sections: [
        {
          ...s("conclusion", "Conclusion", "Reduced capacity."), // same as generated, but still not re-checked
          recheck: { fromVersion: 2, fromReportId: 7, reason: "x", changes: ["A: 1 → 2"], generated: [] },
        },
      ],
    };
    const out = carryForwardSections({
      previous,
      previousGenerated: generatedBefore,
      nextGenerated: generatedAfter,
      changes: ["B: 3 → 4"],
    });
    const c = out.sections.find((x) => x.id === "conclusion")!;
    expect(c.paragraphs).toEqual(["Reduced capacity."]);
    expect(c.recheck!.changes).toEqual([
      "Generated text no longer says: “Reduced capacity.”",
      "Generated text now says: “Reduced capacity; VT1 not low.”",
      "A: 1 → 2",
      "B: 3 → 4",
    ]);
    expect(c.recheck!.fromVersion).toBe(3);
  });
});

describe("describeValueChanges", () => {
  const row = (label: string, value: string, unit: string, pctPredicted?: string): ReportRow => ({
    label,
    value,
    unit,
    method: "m",
    sourceIds: [],
    ...(pctPredicted ? { pctPredicted } : {}),
  });
  it("lists displayed values that differ, rows that appear and rows that disappear", () => {
    const before = [
      row("VT1 (AT)", "890", "mL/min"),
      row("Peak VO2", "1284", "mL/min", "66"),
      row("Peak RER", "1.07", "1"),
      row("Gone", "5", "W"),
    ];
    const after = [
      row("VT1 (AT)", "1100", "mL/min"),
      row("Peak VO2", "1284", "mL/min", "66"),
      row("Peak RER", "1.07", "1"),
      row("New", "not determinable", "W"),
    ];
    expect(describeValueChanges(before, after)).toEqual([
      "VT1 (AT): 890 mL/min → 1100 mL/min",
      "New: newly reported, not determinable",
      "Gone: no longer reported (was 5 W)",
    ]);
  });
});

describe("describeValueChanges: the values read at a threshold", () => {
  it("names each displayed value at the threshold that changed, and predicted and LLN changes", () => {
    const at = (kg: string, pct: string, hr: string, w: string) => [
      { label: "VO2/kg", value: `${kg} mL/kg/min` },
      { label: "% of peak VO2", value: `${pct} % of peak VO2` },
      { label: "HR", value: `HR ${hr} bpm` },
      { label: "work rate", value: `${w} W` },
    ];
    const before: ReportRow[] = [
      { label: "VT1 (AT)", value: "628", unit: "mL/min", method: "m", sourceIds: [], atValues: at("9.7", "61", "120", "44") },
      { label: "Peak VO2", value: "1030", unit: "mL/min", predicted: "1500", lln: "1200", method: "m", sourceIds: [] },
    ];
    const after: ReportRow[] = [
      { label: "VT1 (AT)", value: "582", unit: "mL/min", method: "m", sourceIds: [], atValues: at("9.0", "56", "113", "44") },
      { label: "Peak VO2", value: "1030", unit: "mL/min", predicted: "1450", lln: "1200", method: "m", sourceIds: [] },
    ];
    expect(describeValueChanges(before, after)).toEqual([
      "VT1 (AT): 628 mL/min → 582 mL/min, 9.7 mL/kg/min → 9.0 mL/kg/min, 61 % of peak VO2 → 56 % of peak VO2, HR 120 bpm → HR 113 bpm",
      "Peak VO2: predicted 1500 mL/min → 1450 mL/min",
    ]);
  });
});
