/**
 * Calibration of the threshold bands on synthetic banks (invented data, truth known by construction). Run:
 * `npx tsx scripts/band-calibration.ts` (CAL_SIZE tests per bank over the three noise levels, default 480; CAL_FLOORS,
 * default "0.02,0.03,0.04,0.05"; CAL_LEVEL, the noise level the factor is fitted on, default moderate, or "all").
 * Reads the raw band (`calibrateBand: false`) on the calibration banks (main seeds 99 and 5, variant seeds 2024 and 99,
 * low / moderate / high noise), computes for each floor the split-conformal factor that holds 8 in 10 truths
 * (`conformalFactor`, Lei et al. 2018), then prints the coverage and median width that factor gives on
 * the check banks (main 2024, variant 77) and, at moderate noise, on the four models written blind. The constants in
 * `lib/thresholds/bandCalibration.ts` come from this output.
 */
import { pathToFileURL } from "node:url";
import { quantile } from "../lib/numeric";
import type { NoiseLevel } from "../lib/synthetic";
import { bandScore, conformalFactor } from "../lib/thresholds/bandCalibration";
import { runThresholdBank, type BankGenerator, type BankRow } from "./threshold-bank";

const LEVELS: NoiseLevel[] = ["low", "moderate", "high"];

function consensusRows(generator: BankGenerator, seed: number, size: number, levels: NoiseLevel[]): BankRow[] {
  return runThresholdBank({ size, seed, bootstrap: 20, generator, noiseLevels: levels, calibrateBand: false }).rows.filter(
    (r) => r.method.endsWith("-consensus") && r.band && typeof r.valueMlMin === "number" && r.truthMlMin !== undefined,
  );
}

/** Share of rows whose truth the band widened by `factor` (floor `floor`) holds, and the median relative width, %. */
export function coverage(rows: BankRow[], factor: number, floor: number): { coverPct: number; widthPct: number } {
  if (rows.length === 0) return { coverPct: NaN, widthPct: NaN };
  let held = 0;
  const widths: number[] = [];
  for (const r of rows) {
    const v = r.valueMlMin as number;
    if (bandScore(r.band!, v, r.truthMlMin!, floor) <= factor) held++;
    const below = Math.max(v - r.band!.lowMlMin, floor * v);
    const above = Math.max(r.band!.highMlMin - v, floor * v);
    widths.push((100 * factor * (below + above)) / v);
  }
  return { coverPct: (100 * held) / rows.length, widthPct: quantile(widths, 0.5) };
}

function main(): void {
  const size = Number(process.env.CAL_SIZE ?? 480);
  const floors = (process.env.CAL_FLOORS ?? "0.02,0.03,0.04,0.05").split(",").map(Number);
  const calLevel = process.env.CAL_LEVEL ?? "moderate";
  const calibration = [
    ...consensusRows("main", 99, size, LEVELS),
    ...consensusRows("main", 5, size, LEVELS),
    ...consensusRows("variant", 2024, size, LEVELS),
    ...consensusRows("variant", 99, size, LEVELS),
  ];
  const check = [...consensusRows("main", 2024, size, LEVELS), ...consensusRows("variant", 77, size, LEVELS)];
  const blindSeeds = { holdout: 31, audit: 41, crosscheck: 53, secondopinion: 67 } as const;
  const blind = (Object.keys(blindSeeds) as (keyof typeof blindSeeds)[]).map((g) => ({
    g,
    rows: consensusRows(g, blindSeeds[g], Math.round(size / 4), ["moderate"]),
  }));
  console.log(
    `band calibration (invented data): factor from ${calLevel} noise of ${calibration.filter((r) => r.which === "vt1" && (calLevel === "all" || r.noise === calLevel)).length} calibration tests with a VT1 call, target 80 %`,
  );
  for (const which of ["vt1", "vt2"] as const) {
    for (const floor of floors) {
      const cal = calibration.filter((r) => r.which === which && (calLevel === "all" || r.noise === calLevel));
      const scores = cal.map((r) => bandScore(r.band!, r.valueMlMin as number, r.truthMlMin!, floor));
      const factor = conformalFactor(scores, 0.8);
      const parts = [`${which} floor ${floor.toFixed(2)} factor ${factor.toFixed(2)}`];
      for (const level of LEVELS) {
        const c = coverage(
          check.filter((r) => r.which === which && r.noise === level),
          factor,
          floor,
        );
        parts.push(`check ${level} ${c.coverPct.toFixed(0)} % (width ${c.widthPct.toFixed(1)} %)`);
      }
      for (const b of blind)
        parts.push(
          `${b.g} ${coverage(
            b.rows.filter((r) => r.which === which),
            factor,
            floor,
          ).coverPct.toFixed(0)} %`,
        );
      const raw = coverage(
        check.filter((r) => r.which === which && r.noise === "moderate"),
        1,
        0,
      );
      parts.push(`raw band at moderate ${raw.coverPct.toFixed(0)} %`);
      console.log(parts.join(" · "));
    }
  }
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) main();
