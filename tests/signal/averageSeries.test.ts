import { describe, expect, it } from "vitest";
import type { BreathRow } from "../../lib/breath";
import { AVERAGING_PRESETS, averageSeries, averagingLabel } from "../../lib/signal";

// INVENTED SYNTHETIC DATA: breaths every 4 s with VO2 = 100·i (i = 0…14), so every mean is hand arithmetic.
const rows: readonly BreathRow[] = Object.freeze(
  Array.from({ length: 15 }, (_, i) => Object.freeze({ timeS: i * 4, vo2MlMin: 100 * i, hrBpm: 60 + i })),
);

describe("averageSeries", () => {
  it("none copies", () => {
    const out = averageSeries(rows, { kind: "none", label: "breath by breath (no averaging)" });
    expect(out).toEqual(rows);
    expect(out[0]).not.toBe(rows[0]);
  });

  it("time bins of 20 s: [0,20) holds t = 0,4,8,12,16 → mean VO2 (0+100+200+300+400)/5 = 200 at the bin centre 10 s", () => {
    const out = averageSeries(rows, { kind: "time-bin", seconds: 20, label: "20-s time bins" });
    expect(out.map((r) => r.timeS)).toEqual([10, 30, 50]);
    expect(out.map((r) => r.vo2MlMin)).toEqual([200, 700, 1200]); // (500+…+900)/5 = 700; (1000+…+1400)/5 = 1200
    expect(out[0].hrBpm).toBe(62);
  });

  it("rolling 16-s window centred on each breath: t ± 8 s holds 5 breaths; windows past the ends are dropped", () => {
    const out = averageSeries(rows, { kind: "rolling-time", seconds: 16, label: "" });
    // first full window is centred on t = 8 (0…16), last on t = 48 (40…56)
    expect(out[0].timeS).toBe(8);
    expect(out[out.length - 1].timeS).toBe(48);
    expect(out[0].vo2MlMin).toBe(200); // (0+100+200+300+400)/5
    expect(out.length).toBe(11);
  });

  it("7-breath window: mean of 7 consecutive breaths at their mean time", () => {
    const out = averageSeries(rows, { kind: "breath-count", breaths: 7, label: "" });
    expect(out.length).toBe(15 - 7 + 1);
    expect(out[0].vo2MlMin).toBe(300); // (0+…+600)/7 = 2100/7
    expect(out[0].timeS).toBe(12); // (0+4+…+24)/7 = 84/7
  });

  it("middle 5 of 7 drops the highest and lowest of each field", () => {
    const spiky: BreathRow[] = [1000, 1010, 5000, 990, 1005, 0, 995].map((v, i) => ({ timeS: i * 3, vo2MlMin: v }));
    const out = averageSeries(spiky, { kind: "middle-of-seven", label: "" });
    expect(out.length).toBe(1);
    // drop 5000 and 0: (1000+1010+990+1005+995)/5 = 5000/5 = 1000
    expect(out[0].vo2MlMin).toBe(1000);
    expect(out[0].timeS).toBe(9); // (0+3+…+18)/7 = 63/7
  });

  it("labels are plain words and the presets carry them", () => {
    expect(averagingLabel({ kind: "rolling-time", seconds: 30 })).toBe("30-s rolling time window");
    expect(averagingLabel({ kind: "middle-of-seven" })).toBe("middle 5 of 7 breaths (rolling)");
    // the presets' labels, written out: each names its window in plain words with its own number of seconds/breaths
    expect(AVERAGING_PRESETS.map((p) => p.label)).toEqual([
      "breath by breath (no averaging)",
      "10-s time bins",
      "15-s time bins",
      "20-s time bins",
      "30-s time bins",
      "60-s time bins",
      "15-s rolling time window",
      "30-s rolling time window",
      "7-breath rolling window",
      "15-breath rolling window",
      "middle 5 of 7 breaths (rolling)",
    ]);
    for (const p of AVERAGING_PRESETS) {
      if (p.seconds !== undefined) expect(p.label.startsWith(`${p.seconds}-s `), p.label).toBe(true);
      if (p.breaths !== undefined) expect(p.label.startsWith(`${p.breaths}-breath `), p.label).toBe(true);
    }
  });
});
