import type { ReportModel } from "../../lib/report/reportModel";
import { CLINICAL_CAUTION, DRAFT_CAUTION } from "../../lib/report/caution";
import { timeCourseChart } from "../../lib/report/charts/timeCourseChart";
import { vSlopeChart } from "../../lib/report/charts/vSlopeChart";

/**
 * INVENTED example report (not patient data, not a published case): a small, fixed model with
 * round numbers, used to test the PDF writer and the page. Series are synthetic straight lines.
 */
export function exampleReportModel(overrides: Partial<ReportModel> = {}): ReportModel {
  const timeS = Array.from({ length: 121 }, (_, i) => i * 5); // 0-600 s every 5 s
  const vo2 = timeS.map((t) => 400 + 3 * t); // invented: 400 → 2200 mL/min
  const vco2 = vo2.map((v) => (v < 1400 ? 0.9 * v : 1260 + 1.3 * (v - 1400))); // invented kink at 1400
  const hr = timeS.map((t) => 70 + t / 6);
  return {
    title: "Exercise test report - Example case (invented)",
    patientLine: "male, 45 y, 178 cm, 78 kg (invented)",
    testLine: "cycle ergometer, ramp 25 W/min, duration 10:00 min:s",
    referral: "General / unexplained breathlessness",
    engineVersion: "0.0.0-example",
    status: "draft",
    caution: CLINICAL_CAUTION,
    draftMark: DRAFT_CAUTION,
    keyValues: [
      {
        label: "Peak VO₂",
        value: "2200",
        unit: "mL/min",
        predicted: "2750",
        pctPredicted: "80",
        lln: "2100",
        method: "highest 30-s rolling average",
        sourceIds: ["peak-rolling-average"],
      },
      {
        label: "Peak HR",
        value: "170",
        unit: "beats/min",
        method: "highest 30-s rolling average",
        sourceIds: ["common-practice"],
      },
    ],
    thresholds: [
      { label: "VT1 (VO₂)", value: "1400", unit: "mL/min", method: "V-slope, ≥ 2 segments", sourceIds: ["beaver-1986"] },
    ],
    charts: [
      timeCourseChart({ timeS, vo2MlMin: vo2, vco2MlMin: vco2, hrBpm: hr, vt1TimeS: 333.3 }),
      vSlopeChart({ vo2MlMin: vo2, vco2MlMin: vco2, vt1Vo2MlMin: 1400 }),
    ],
    sections: [
      {
        id: "summary",
        title: "Summary",
        paragraphs: ["Peak VO2 was 2200 mL/min (highest 30-s average). Invented example text."],
      },
      { id: "comment", title: "Comment", paragraphs: ["Δ between tests: none (invented)."] },
    ],
    path: [
      {
        step: 1,
        variable: "Peak VO2 % predicted",
        value: "80",
        cutoff: "≥ 80 %",
        outcome: "within expected range",
        sourceIds: ["common-practice"],
      },
    ],
    schemes: [
      {
        name: "Example scheme (invented)",
        category: "A",
        severity: 0,
        inputs: ["peak VO2 28.2 mL/kg/min"],
        sourceIds: ["common-practice"],
      },
    ],
    issues: [{ severity: "warning", code: "example-warning", message: "Example warning (invented)." }],
    sources: [
      {
        id: "peak-rolling-average",
        citation: "Highest 20-30 s average of VO2 as peak VO2 (common practice)",
        status: "common-practice",
      },
      { id: "common-practice", citation: "Common practice in clinical exercise testing", status: "common-practice" },
      { id: "beaver-1986", citation: "Beaver WL, Wasserman K, Whipp BJ. J Appl Physiol 1986;60:2020-2027", status: "confirmed" },
    ],
    methods: ["Peak values: highest 30-s rolling average."],
    ...overrides,
  };
}
