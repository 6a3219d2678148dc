/**
 * Calibration of the threshold bands on synthetic banks (invented data, truth known by construction). Run:
 * `npx tsx scripts/band-calibration.ts` (CAL_SIZE tests per bank over the three noise levels, default 480; CAL_FLOORS,
 * default "0.02,0.03,0.04,0.05"; CAL_LEVEL, the noise level the factor is fitted on, default moderate, or "all").
 * Reads the raw band (`calibrateBand: false`) on the calibration banks (main seeds 99 and 5, variant seeds 2024 and 99,
 * low / moderate / high noise), computes for each floor the split-conformal factor that holds 8 in 10 truths
 * (`conformalFactor`, Lei et al. 2018), then prints the coverage and median width that factor gives on
 * the check banks (main 2024, variant 77) and, at moderate noise, on the four models written blind; then the same for
 * the VE/VCO2 slope to VT2, whose score is its error in units of its relative standard error (`slopeRelativeScale`).
 * The constants in `lib/thresholds/bandCalibration.ts` come from this output.
 */
import { pathToFileURL } from "node:url";
import { quantile } from "../lib/numeric";
import type { NoiseLevel } from "../lib/synthetic";
import { bandScore, calibrateBand, conformalFactor } from "../lib/thresholds/bandCalibration";
import { runThresholdBank, type BankGenerator, type BankRow } from "./threshold-bank";

const LEVELS: NoiseLevel[] = ["low", "moderate", "high"];

/** Threshold consensus rows with a raw band, and slope rows with a scale, of one bank. */
function bankRows(generator: BankGenerator, seed: number, size: number, levels: NoiseLevel[]): BankRow[] {
  return runThresholdBank({ size, seed, bootstrap: 20, generator, noiseLevels: levels, calibrateBand: false }).rows.filter(
    (r) =>
      typeof r.value === "number" &&
      r.truth !== undefined &&
      ((r.method.endsWith("-consensus") && r.band) || (r.method === SLOPE && typeof r.scale === "number")),
  );
}

const SLOPE = "ve-vco2-slope-to-vt2";

/** Slope score: |truth − slope| in units of slope × scale (the band slope × (1 ± f·scale) holds the truth iff ≤ f). */
const slopeScore = (r: BankRow) =>
  Math.abs((r.truth as number) - (r.value as number)) / ((r.value as number) * (r.scale as number));

function slopeCoverage(rows: BankRow[], factor: number): { coverPct: number; widthPct: number } {
  if (rows.length === 0) return { coverPct: NaN, widthPct: NaN };
  const held = rows.filter((r) => slopeScore(r) <= factor).length;
  return {
    coverPct: (100 * held) / rows.length,
    widthPct: quantile(
      rows.map((r) => 200 * factor * (r.scale as number)),
      0.5,
    ),
  };
}

const raw = (r: BankRow) => ({ lowMlMin: r.band!.low, highMlMin: r.band!.high });

/** Share of rows whose truth the band widened by `factor` (floor `floor`) holds, and the median relative width, %. */
export function coverage(rows: BankRow[], factor: number, floor: number): { coverPct: number; widthPct: number } {
  if (rows.length === 0) return { coverPct: NaN, widthPct: NaN };
  let held = 0;
  const widths: number[] = [];
  for (const r of rows) {
    const v = r.value as number;
    if (bandScore(raw(r), v, r.truth as number, floor) <= factor) held++;
    const b = calibrateBand(raw(r), v, { factor, floorFraction: floor });
    widths.push((100 * (b.highMlMin - b.lowMlMin)) / v);
  }
  return { coverPct: (100 * held) / rows.length, widthPct: quantile(widths, 0.5) };
}

function main(): void {
  const size = Number(process.env.CAL_SIZE ?? 480);
  const floors = (process.env.CAL_FLOORS ?? "0.02,0.03,0.04,0.05").split(",").map(Number);
  const calLevel = process.env.CAL_LEVEL ?? "moderate";
  const calibration = [
    ...bankRows("main", 99, size, LEVELS),
    ...bankRows("main", 5, size, LEVELS),
    ...bankRows("variant", 2024, size, LEVELS),
    ...bankRows("variant", 99, size, LEVELS),
  ];
  const check = [...bankRows("main", 2024, size, LEVELS), ...bankRows("variant", 77, size, LEVELS)];
  const blindSeeds = { holdout: 31, audit: 41, crosscheck: 53, secondopinion: 67 } as const;
  const blind = (Object.keys(blindSeeds) as (keyof typeof blindSeeds)[]).map((g) => ({
    g,
    rows: bankRows(g, blindSeeds[g], Math.round(size / 4), ["moderate"]),
  }));
  console.log(
    `band calibration (invented data): factor from ${calLevel} noise of ${calibration.filter((r) => r.which === "vt1" && (calLevel === "all" || r.noise === calLevel)).length} calibration tests with a VT1 call, target 80 %`,
  );
  for (const which of ["vt1", "vt2"] as const) {
    for (const floor of floors) {
      const cal = calibration.filter(
        (r) => r.which === which && r.method.endsWith("-consensus") && (calLevel === "all" || r.noise === calLevel),
      );
      const scores = cal.map((r) => bandScore(raw(r), r.value as number, r.truth as number, floor));
      const factor = conformalFactor(scores, 0.8);
      const parts = [`${which} floor ${floor.toFixed(2)} factor ${factor.toFixed(2)}`];
      for (const level of LEVELS) {
        const c = coverage(
          check.filter((r) => r.which === which && r.method.endsWith("-consensus") && r.noise === level),
          factor,
          floor,
        );
        parts.push(`check ${level} ${c.coverPct.toFixed(0)} % (width ${c.widthPct.toFixed(1)} %)`);
      }
      for (const b of blind)
        parts.push(
          `${b.g} ${coverage(
            b.rows.filter((r) => r.which === which && r.method.endsWith("-consensus")),
            factor,
            floor,
          ).coverPct.toFixed(0)} %`,
        );
      const rawCover = coverage(
        check.filter((r) => r.which === which && r.method.endsWith("-consensus") && r.noise === "moderate"),
        1,
        0,
      );
      parts.push(`raw band at moderate ${rawCover.coverPct.toFixed(0)} %`);
      console.log(parts.join(" · "));
    }
  }
  const slopeCal = calibration.filter((r) => r.method === SLOPE && (calLevel === "all" || r.noise === calLevel));
  const slopeFactor = conformalFactor(slopeCal.map(slopeScore), 0.8);
  const parts = [`slope to VT2: factor ${slopeFactor.toFixed(2)} on ${slopeCal.length} tests`];
  for (const level of LEVELS) {
    const c = slopeCoverage(
      check.filter((r) => r.method === SLOPE && r.noise === level),
      slopeFactor,
    );
    parts.push(`check ${level} ${c.coverPct.toFixed(0)} % (width ${c.widthPct.toFixed(1)} %)`);
  }
  for (const b of blind)
    parts.push(
      `${b.g} ${slopeCoverage(
        b.rows.filter((r) => r.method === SLOPE),
        slopeFactor,
      ).coverPct.toFixed(0)} %`,
    );
  console.log(parts.join(" · "));
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) main();
