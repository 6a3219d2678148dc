/**
 * End to end: the INVENTED normal study (tests/fixtures/cases/normal-adult.csv, synthetic generator preset normal-adult,
 * seed 101: rest to 3:00, unloaded pedalling, ramp from about 6:02 to 15:13, recovery) with INVENTED arterial blood
 * gases (rest PaCO2 5.3 kPa, peak 4.8 kPa, i.e. 39.8 and 36.0 mmHg by 1 kPa = 7.50062 mmHg) given three ways: by label
 * only, by time in minutes without a unit, and by time in seconds with labels. A normal study must not be called
 * "abnormal gas exchange" by any of them; the peak VD/VT read by label agrees with the one read at the sample's time.
 */
import { beforeAll, describe, expect, it } from "vitest";
import { analyse, type AnalysisResult, type TestRecord } from "../../lib/analysis";
import { caseRecord } from "../fixtures/caseRecord";
import { importBloodGasFile } from "../../lib/breath";

let base: TestRecord;

beforeAll(async () => {
  // the demo's context is left out: only the gases below are under test
  base = { ...(await caseRecord("normal-adult")), context: undefined };
}, 60_000);

/** Import the (invented) blood-gas file, store it as the app does (JSON), analyse. */
async function withGases(text: string, timeUnit: "s" | "min" = "s"): Promise<AnalysisResult> {
  const imp = await importBloodGasFile(new TextEncoder().encode(text), { timeUnit });
  const record = JSON.parse(JSON.stringify({ ...base, bloodGases: imp.samples })) as TestRecord;
  return analyse(record);
}
const gasStep = (r: AnalysisResult) => r.interpretation.path.steps.find((s) => s.nodeId === "gas-exchange")?.outcome;
const codes = (r: AnalysisResult) => r.issues.map((i) => i.code);

describe("blood gases on the invented normal study", () => {
  it("labels only (rest, peak): placed at rest and at the end of exercise; peak VD/VT normal", async () => {
    const r = await withGases("label,PaO2,PaCO2\nrest,12.7,5.3\npeak,11.7,4.8\n");
    const [rest, peak] = r.indices.vdVt;
    expect([rest.phase, peak.phase]).toEqual(["rest", "exercise"]);
    expect(peak.atPeak).toBe(true);
    expect(peak.paCO2MmHg).toBe(36);
    expect(r.interpretInput.values.vdvtPeak).toBeLessThan(0.28); // normal peak < 0.28 (Hansen 1984, confirmed)
    expect(gasStep(r)).not.toBe("abnormal");
    // the same gases with times (120 s rest, 900 s = 15:00 at peak) give the same peak VD/VT within 0.01
    const timed = await withGases("time_s,label,PaO2 (mmHg),PaCO2 (mmHg)\n120,rest,95,40\n900,peak,88,36\n");
    expect(Math.abs(timed.interpretInput.values.vdvtPeak! - r.interpretInput.values.vdvtPeak!)).toBeLessThan(0.01);
    expect(gasStep(timed)).not.toBe("abnormal");
  });

  it("times in minutes without a unit: read as seconds they fall before exercise → warning and no peak VD/VT", async () => {
    const text = "time,PaO2,PaCO2\n2,95,40\n15,88,36\n";
    const asSeconds = await withGases(text);
    expect(codes(asSeconds)).toContain("blood-gas-times-before-exercise");
    expect(asSeconds.interpretInput.values.vdvtPeak ?? null).toBeNull();
    expect(gasStep(asSeconds)).not.toBe("abnormal");
    // chosen as minutes: 120 s and 900 s, peak VD/VT normal
    const asMinutes = await withGases(text, "min");
    expect(asMinutes.indices.vdVt.map((p) => p.timeS)).toEqual([120, 900]);
    expect(asMinutes.indices.vdVt[1].atPeak).toBe(true);
    expect(asMinutes.interpretInput.values.vdvtPeak).toBeLessThan(0.28);
    expect(gasStep(asMinutes)).not.toBe("abnormal");
    expect(codes(asMinutes)).not.toContain("blood-gas-times-before-exercise");
  });
});
