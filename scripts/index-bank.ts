/**
 * Accuracy bank for the slope indices on synthetic tests (invented data, truth known by construction): the whole-exercise
 * VE/VCO2 slope, OUES over 100 / 90 / 75 % of exercise and ΔVO2/ΔWR, each against the same least-squares line fitted to
 * the noise-free breaths of the true incremental phase. Run: `npx tsx scripts/index-bank.ts` (INDEX_SETS, default
 * "main:2024,variant:77,holdout:31,audit:41,crosscheck:53,secondopinion:67"; INDEX_SIZE tests per set over low /
 * moderate / high noise, default 240). Prints per index and noise level the signed and absolute median error, the 90th
 * percentile, the share within ±5 % and how often the band holds the truth. `INDEX_CALIBRATE=1` instead fits the band
 * factors (`INDEX_BAND_FACTORS` in lib/thresholds/bandCalibration.ts) on the calibration banks and prints the coverage
 * they give on the check banks and the models written blind, as `scripts/band-calibration.ts` does for the thresholds.
 * No threshold is detected: none of these lines depends on one.
 */
import { pathToFileURL } from "node:url";
import type { BreathTable } from "../lib/breath";
import { quantile } from "../lib/numeric";
import { PrefixSums } from "../lib/numeric/linearRegression";
import { conditionTable } from "../lib/signal";
import { recolourNoise, type NoiseLevel, type SyntheticTruth } from "../lib/synthetic";
import { conformalFactor, indexBand, type SlopeIndexName } from "../lib/thresholds/bandCalibration";
import { dVo2dWr } from "../lib/thresholds/dVo2dWr";
import { oues } from "../lib/thresholds/oues";
import { bandCentre, lineBandScale, veVco2Slope, type LineIndex } from "../lib/thresholds/veVco2Slope";
import { bankCases, bankGenerator } from "./threshold-bank";

const LEVELS: NoiseLevel[] = ["low", "moderate", "high"];

/** One index of one test: what the engine reported and the noise-free truth. */
export interface IndexRow {
  id: string;
  noise: NoiseLevel;
  /** "ve-vco2-slope-whole", "oues-100", "oues-90", "oues-75" or "dvo2-dwr". */
  index: string;
  /** Which band factor the index takes. */
  family: SlopeIndexName;
  value: number | null;
  /** Where the band is centred (`bandCentre`: the dilution-corrected slope, or the value). */
  centre: number | null;
  truth: number;
  band: { low: number; high: number } | null;
  /** Relative scale the band is built on (`lineBandScale`: r², points fitted and the residuals' lag-1 autocorrelation). */
  scale: number | null;
}

export interface IndexStats {
  index: string;
  noise: NoiseLevel | "all";
  n: number;
  signedMedianPct: number;
  medianPct: number;
  /** The band centre's signed median error and share within ±5 % (the dilution-corrected slope where there is one). */
  centreSignedMedianPct: number;
  centreWithin5Pct: number;
  p90Pct: number;
  noCallPct: number;
  /** Share of all tests (no-calls count as misses) within ±5 % of the truth. */
  within5Pct: number;
  /** Share of the values with a band whose band holds the truth; NaN when none has a band. */
  bandCoverPct: number;
  /** Median band width, % of the value. */
  bandWidthPct: number;
}

/**
 * OUES of the noise-free breaths: OLS of VO2 (mL/min) on log10 VE (L/min) over the first `fraction` of the true
 * incremental phase (Baba et al. 1996, the estimator of lib/thresholds/oues.ts), the generators' own convention for
 * their VE/VCO2 truth (noise-free breaths, ramp start to ramp end).
 */
export function ouesTruth(noiseFree: BreathTable, truth: SyntheticTruth, fraction: number): number {
  const { warmupEndS, rampEndS } = truth.phases;
  const endS = warmupEndS + fraction * (rampEndS - warmupEndS);
  const x: number[] = [];
  const y: number[] = [];
  for (const r of noiseFree.rows)
    if (r.timeS >= warmupEndS && r.timeS <= endS && (r.veLMin ?? 0) > 0 && Number.isFinite(r.vo2MlMin)) {
      x.push(Math.log10(r.veLMin as number));
      y.push(r.vo2MlMin as number);
    }
  return new PrefixSums(x, y).fit(0, x.length).slope;
}

function row(id: string, noise: NoiseLevel, index: string, family: SlopeIndexName, line: LineIndex, truth: number): IndexRow {
  return {
    id,
    noise,
    index,
    family,
    value: line.slope.value,
    centre: bandCentre(line),
    truth,
    band: line.band ?? null,
    scale: lineBandScale(line),
  };
}

/** Run one bank: one row per test and index with a finite, positive truth (ΔVO2/ΔWR needs a work rate). */
export function runIndexBank(options: {
  generator: string;
  size: number;
  seed?: number;
  noiseLevels?: NoiseLevel[];
  /** Lag-1 correlation given to the breath noise (`recolourNoise`; 0 = each model's own noise). */
  noiseRho?: number;
}): IndexRow[] {
  const rows: IndexRow[] = [];
  const cases = bankCases(bankGenerator(options.generator), options.size, options.seed, options.noiseLevels ?? LEVELS);
  for (const c of cases) {
    const syn = c.make();
    const test = conditionTable(options.noiseRho ? recolourNoise(syn.table, syn.noiseFree, options.noiseRho) : syn.table);
    rows.push(
      row(
        c.id,
        syn.noise,
        "ve-vco2-slope-whole",
        "veVco2Whole",
        veVco2Slope(test).slopeWholeExercise,
        syn.truth.veVco2SlopeToPeak,
      ),
    );
    for (const fit of oues(test).fits) {
      const truth = ouesTruth(syn.noiseFree, syn.truth, fit.fraction);
      if (Number.isFinite(truth) && truth > 0)
        rows.push(row(c.id, syn.noise, `oues-${Math.round(fit.fraction * 100)}`, "oues", fit, truth));
    }
    const dwr = syn.truth.deltaVo2DeltaWrMlMinW;
    if (Number.isFinite(dwr) && dwr > 0) rows.push(row(c.id, syn.noise, "dvo2-dwr", "dVo2dWr", dVo2dWr(test).whole, dwr));
  }
  return rows;
}

/** Accuracy and band coverage per index and noise level (and over all levels). */
export function indexStats(rows: IndexRow[]): IndexStats[] {
  const stats: IndexStats[] = [];
  for (const index of [...new Set(rows.map((r) => r.index))])
    for (const noise of [...LEVELS, "all"] as const) {
      const sel = rows.filter((r) => r.index === index && (noise === "all" || r.noise === noise));
      if (sel.length === 0) continue;
      const signed = sel.filter((r) => r.value !== null).map((r) => (100 * ((r.value as number) - r.truth)) / r.truth);
      const abs = signed.map(Math.abs);
      const centred = sel.filter((r) => r.centre !== null).map((r) => (100 * ((r.centre as number) - r.truth)) / r.truth);
      const banded = sel.filter((r) => r.value !== null && r.band);
      stats.push({
        index,
        noise,
        n: sel.length,
        signedMedianPct: quantile(signed, 0.5),
        medianPct: quantile(abs, 0.5),
        centreSignedMedianPct: quantile(centred, 0.5),
        centreWithin5Pct: (100 * centred.filter((e) => Math.abs(e) <= 5).length) / sel.length,
        p90Pct: quantile(abs, 0.9),
        noCallPct: (100 * (sel.length - signed.length)) / sel.length,
        within5Pct: (100 * abs.filter((e) => e <= 5).length) / sel.length,
        bandCoverPct: banded.length
          ? (100 * banded.filter((r) => r.band!.low <= r.truth && r.truth <= r.band!.high).length) / banded.length
          : NaN,
        bandWidthPct: banded.length
          ? quantile(
              banded.map((r) => (100 * (r.band!.high - r.band!.low)) / (r.value as number)),
              0.5,
            )
          : NaN,
      });
    }
  return stats;
}

/**
 * Score of a row: |truth − centre| in units of centre × scale (the band centre × (1 ± f·scale) holds the truth iff ≤ f;
 * the reported band also joins the value, which can only add to what it holds).
 */
export function indexScore(r: IndexRow): number {
  return r.centre === null || r.scale === null ? NaN : Math.abs(r.truth - r.centre) / (Math.abs(r.centre) * r.scale);
}

function calibrate(size: number): void {
  const bank = (generator: string, seed: number, levels = LEVELS, n = size) =>
    runIndexBank({ generator, seed, size: n, noiseLevels: levels });
  const calibration = [...bank("main", 99), ...bank("main", 5), ...bank("variant", 2024), ...bank("variant", 99)];
  const check = [...bank("main", 2024), ...bank("variant", 77)];
  const blindSeeds = { holdout: 31, audit: 41, crosscheck: 53, secondopinion: 67 };
  const blind = Object.entries(blindSeeds).map(([g, seed]) => ({ g, rows: bank(g, seed, ["moderate"], Math.round(size / 3)) }));
  // the band as the engine builds it with factor f
  const bandOf = (r: IndexRow, f: number) => indexBand(r.centre as number, r.value as number, r.scale, f)!;
  const banded = (rows: IndexRow[]) => rows.filter((r) => Number.isFinite(indexScore(r)) && r.value !== null);
  const cover = (rows: IndexRow[], f: number) => {
    const s = banded(rows);
    const held = s.filter((r) => bandOf(r, f).low <= r.truth && r.truth <= bandOf(r, f).high).length;
    return s.length ? `${((100 * held) / s.length).toFixed(0)} %` : "–";
  };
  const width = (rows: IndexRow[], f: number) =>
    quantile(
      banded(rows).map((r) => (100 * (bandOf(r, f).high - bandOf(r, f).low)) / Math.abs(r.value as number)),
      0.5,
    ).toFixed(1);
  console.log("index band calibration (invented data): factor from the moderate-noise calibration tests, target 80 %");
  for (const family of ["veVco2Whole", "oues", "dVo2dWr"] as const) {
    const cal = calibration.filter((r) => r.family === family && r.noise === "moderate");
    const factor = conformalFactor(cal.map(indexScore), 0.8);
    const parts = [`${family}: factor ${factor.toFixed(2)} on ${cal.length} values`];
    for (const level of LEVELS) {
      const c = check.filter((r) => r.family === family && r.noise === level);
      parts.push(`check ${level} ${cover(c, factor)} (width ${width(c, factor)} %)`);
    }
    for (const b of blind)
      parts.push(
        `${b.g} ${cover(
          b.rows.filter((r) => r.family === family),
          factor,
        )}`,
      );
    for (const index of [...new Set(check.filter((r) => r.family === family).map((r) => r.index))])
      if (index !== family)
        parts.push(
          `${index} check moderate ${cover(
            check.filter((r) => r.index === index && r.noise === "moderate"),
            factor,
          )}`,
        );
    console.log(parts.join(" · "));
  }
}

function main(): void {
  const size = Number(process.env.INDEX_SIZE ?? 240);
  if (process.env.INDEX_CALIBRATE === "1") return calibrate(size);
  const sets = (process.env.INDEX_SETS ?? "main:2024,variant:77,holdout:31,audit:41,crosscheck:53,secondopinion:67").split(",");
  const noiseRho = Number(process.env.INDEX_RHO ?? 0);
  console.log(
    `index bank: ${size} synthetic tests per set (invented data)${noiseRho ? `, breath noise re-coloured to lag-1 correlation ${noiseRho}` : ""}; errors as % of the noise-free truth`,
  );
  console.log(
    "set            index                noise       n  signed%  median%  P90%  no-call%  ≤5%  band holds%  width%  centre: signed%  ≤5%",
  );
  for (const set of sets) {
    const [generator, seed] = set.split(":");
    for (const s of indexStats(runIndexBank({ generator, seed: Number(seed), size, noiseRho }))) {
      console.log(
        `${generator.padEnd(15)}${s.index.padEnd(21)}${s.noise.padEnd(9)}${String(s.n).padStart(5)}${s.signedMedianPct.toFixed(1).padStart(9)}${s.medianPct.toFixed(1).padStart(9)}${s.p90Pct.toFixed(1).padStart(6)}${s.noCallPct.toFixed(1).padStart(10)}${s.within5Pct.toFixed(0).padStart(5)}${(Number.isNaN(s.bandCoverPct) ? "–" : s.bandCoverPct.toFixed(0)).padStart(13)}${(Number.isNaN(s.bandWidthPct) ? "–" : s.bandWidthPct.toFixed(1)).padStart(8)}${s.centreSignedMedianPct.toFixed(1).padStart(17)}${s.centreWithin5Pct.toFixed(0).padStart(5)}`,
      );
    }
  }
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) main();
