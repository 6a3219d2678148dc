import { describe, expect, it } from "vitest";
import { cleanRrIntervals, importBreathFile, RR_NEIGHBOUR_FRACTION } from "../../lib/breath";

// SYNTHETIC beat series: every expected value below is known by construction (the rate of a group of beats is
// 60 000 × beats / Σ R–R in ms, common practice), not read back from the importer.

const enc = (text: string) => new TextEncoder().encode(text);

describe("cleanRrIntervals", () => {
  it("keeps a steady rhythm and a ramp whole", () => {
    const steady = cleanRrIntervals(Array.from({ length: 200 }, () => 400));
    expect(steady).toMatchObject({ beats: 200, outOfRange: 0, irregular: 0 });
    // a ramp from 60 to 190 beats/min over 600 beats changes by far less than 20 % over ten beats
    const ramp = Array.from({ length: 600 }, (_, i) => 60000 / (60 + (130 * i) / 599));
    expect(cleanRrIntervals(ramp).irregular).toBe(0);
  });

  it("sets aside a premature beat and its pause, a missed detection and an impossible interval, and nothing else", () => {
    const rr = Array.from({ length: 120 }, () => 500);
    rr[30] = 300; // premature beat: 40 % short …
    rr[31] = 700; // … and the compensatory pause (the two together span two normal beats)
    rr[60] = 1000; // one R wave not detected: one interval spans two beats
    rr[90] = 3000; // outside 200–2400 ms
    rr[100] = NaN; // no value
    const c = cleanRrIntervals(rr);
    expect(c).toMatchObject({ beats: 119, outOfRange: 1, irregular: 3 });
    const aside = [...c.clean.keys()].filter((i) => Number.isNaN(c.clean[i]));
    expect(aside).toEqual([30, 31, 60, 90, 100]);
  });

  it("a beat just inside the 20 % rule is kept, one just outside is not", () => {
    const rr = Array.from({ length: 40 }, () => 500);
    rr[10] = 500 * (1 + RR_NEIGHBOUR_FRACTION) - 1;
    rr[25] = 500 * (1 + RR_NEIGHBOUR_FRACTION) + 1;
    const c = cleanRrIntervals(rr);
    expect(Number.isNaN(c.clean[10])).toBe(false);
    expect(Number.isNaN(c.clean[25])).toBe(true);
  });
});

/**
 * One row per heartbeat: time of the beat (s), its R–R interval (ms), and the VO2 of the latest breath carried along
 * (a new breath every 3 s) — the layout of beat-by-beat recordings. Heart rate rises 80 → 170 beats/min over 600 s.
 */
function beatFile(opts: { premature?: number[]; hrColumn?: boolean } = {}) {
  const beats: { t: number; rr: number; breath: number }[] = [];
  let t = 0;
  while (t < 600) {
    const hr = 80 + (90 * t) / 600;
    let rr = 60000 / hr;
    const i = beats.length;
    if (opts.premature?.includes(i)) rr *= 0.65;
    if (opts.premature?.includes(i - 1)) rr = (2 * 60000) / hr - beats[i - 1].rr;
    t += rr / 1000;
    beats.push({ t, rr, breath: Math.floor(t / 3) });
  }
  const lines = [`time_s,vo2_ml_min,work_w,RR${opts.hrColumn ? ",hr_bpm" : ""}`];
  for (const b of beats) {
    const vo2 = 400 + 4 * b.breath * 3 + (b.breath % 2); // distinct from one breath to the next
    lines.push(
      `${b.t.toFixed(3)},${vo2},${Math.round(b.t / 6)},${b.rr.toFixed(1)}${opts.hrColumn ? `,${Math.round(60000 / b.rr)}` : ""}`,
    );
  }
  return { bytes: enc(lines.join("\n")), beats };
}

describe("heart rate from an R–R column", () => {
  it("a beat-by-beat file: each breath's heart rate is the rate of its own beats", async () => {
    const { bytes, beats } = beatFile();
    const r = await importBreathFile(bytes);
    expect(r.columns.find((c) => c.header === "RR")).toMatchObject({ field: "hrBpm", unit: "R–R interval, ms" });
    const rows = r.table!.rows;
    expect(rows.length).toBe(new Set(beats.map((b) => b.breath)).size);
    for (const row of rows.slice(1, -1)) {
      const mine = beats.filter((b) => Math.floor(b.t / 3) === Math.floor(row.timeS / 3));
      const expected = (60000 * mine.length) / mine.reduce((s, b) => s + Number(b.rr.toFixed(1)), 0);
      expect(row.hrBpm!).toBeCloseTo(expected, 6);
    }
    const note = r.issues.find((i) => i.code === "hr-from-rr-intervals")!;
    expect(note.severity).toBe("info");
    expect(note.message).toMatch(/All \d+ beats were regular enough to keep/);
  });

  it("a premature beat does not move its breath's heart rate by more than 1 beat/min", async () => {
    const plain = await importBreathFile(beatFile().bytes);
    const withEctopic = await importBreathFile(beatFile({ premature: [500] }).bytes);
    const note = withEctopic.issues.find((i) => i.code === "hr-from-rr-intervals")!;
    expect(note.message).toMatch(/2 of \d+ beats .* set aside: 0 outside 200–2400 ms and 2 more than 20 %/);
    const a = plain.table!.rows;
    const b = withEctopic.table!.rows;
    expect(b.length).toBe(a.length);
    for (let i = 0; i < a.length; i++) expect(Math.abs(a[i].hrBpm! - b[i].hrBpm!)).toBeLessThan(1);
  });

  it("an HR column wins over R–R intervals, and the R–R column says why it was not used", async () => {
    const r = await importBreathFile(beatFile({ hrColumn: true }).bytes);
    const rr = r.columns.find((c) => c.header === "RR")!;
    expect(rr.field).toBeNull();
    expect(rr.reason).toMatch(/heart rate is read from "hr_bpm"/);
    expect(r.issues.map((i) => i.code)).not.toContain("hr-from-rr-intervals");
  });

  it("an HR column holding milliseconds is read as R–R intervals, one per breath row", async () => {
    // 30 breaths 3 s apart, heart period 600 → 400 ms (100 → 150 beats/min)
    const lines = ["time_s,vo2_ml_min,HR"];
    for (let i = 0; i < 30; i++) lines.push(`${3 * i},${500 + 40 * i},${600 - (200 * i) / 29}`);
    const r = await importBreathFile(enc(lines.join("\n")));
    expect(r.columns.find((c) => c.header === "HR")?.unit).toBe("R–R interval, ms");
    expect(r.table!.rows[0].hrBpm).toBeCloseTo(100, 9);
    expect(r.table!.rows[29].hrBpm).toBeCloseTo(150, 9);
    expect(r.issues.find((i) => i.code === "hr-from-rr-intervals")?.message).toMatch(/over the beats of each row/);
  });

  it.each([
    ["RRI", "hrBpm"],
    ["RR", "rrBrMin"],
  ])("a %s column in seconds (0.40–0.60) is read as R–R intervals, not as a rate", async (header) => {
    const lines = [`time_s,vo2_ml_min,${header}`];
    for (let i = 0; i < 30; i++) lines.push(`${3 * i},${500 + 40 * i},${(0.6 - (0.2 * i) / 29).toFixed(4)}`);
    const r = await importBreathFile(enc(lines.join("\n")));
    expect(r.columns.find((c) => c.header === header)).toMatchObject({ field: "hrBpm", unit: "R–R interval, s", factor: 1000 });
    // 60 / 0.6 s = 100 beats/min; 60 / 0.4 s = 150 beats/min
    expect(r.table!.rows[0].hrBpm).toBeCloseTo(100, 9);
    expect(r.table!.rows[29].hrBpm).toBeCloseTo(150, 9);
    expect(r.table!.fields).not.toContain("rrBrMin");
  });

  it("an irregular rhythm throughout (intervals ±35 %) is questioned, not silently averaged", async () => {
    let seed = 7;
    const rand = () => ((seed = (seed * 1103515245 + 12345) % 2 ** 31) / 2 ** 31) * 2 - 1;
    const lines = ["time_s,vo2_ml_min,RR"];
    let t = 0;
    for (let i = 0; i < 900; i++) {
      const rr = 500 * (1 + 0.35 * rand());
      t += rr / 1000;
      lines.push(`${t.toFixed(3)},${400 + Math.floor(t / 3) * 5},${rr.toFixed(0)}`);
    }
    const r = await importBreathFile(enc(lines.join("\n")));
    const note = r.issues.find((i) => i.code === "hr-from-rr-intervals")!;
    expect(note.severity).toBe("warning");
    expect(note.message).toMatch(/Check the ECG/);
  });
});
