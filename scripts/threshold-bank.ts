/**
 * Accuracy bank for ventilatory-threshold detection on synthetic tests (invented data, truth known by
 * construction). Run: `npx tsx scripts/threshold-bank.ts` (BANK_SIZE, BANK_SEED, BANK_BIN_S, BANK_BOOTSTRAP,
 * BANK_GENERATOR = main | variant | holdout | audit | crosscheck | secondopinion env).
 * Prints per method and for the consensus: median and 90th-percentile absolute error as % of the true VO2,
 * and the no-call rate, by noise level.
 */
import { pathToFileURL } from "node:url";
import { conditionTable } from "../lib/signal";
import {
  auditSpec,
  crossCheckSpec,
  generateSecondOpinionTest,
  secondOpinionSpec,
  generateAuditTest,
  generateCrossCheckTest,
  generateHoldoutTest,
  generateSyntheticTest,
  generateVariantTest,
  holdoutSpec,
  recolourNoise,
  syntheticBank,
  variantSpec,
  type NoiseLevel,
  type SyntheticTruth,
} from "../lib/synthetic";
import { detectThresholds } from "../lib/thresholds/detectThresholds";
import { quantile } from "../lib/numeric";
import { slopeRelativeScale } from "../lib/thresholds/bandCalibration";
import { fittedPoints, veVco2Slope, type LineIndex } from "../lib/thresholds/veVco2Slope";

export interface BankRow {
  id: string;
  noise: NoiseLevel;
  which: "vt1" | "vt2";
  method: string;
  /** Absolute error as % of the true VO2; null = no call. */
  errorPct: number | null;
  confidence?: string;
  /** Consensus and slope rows: the value, the truth and the band reported (VO2 in mL/min; the slope unitless). */
  value?: number | null;
  truth?: number;
  band?: { low: number; high: number } | null;
  /** Slope rows: the slope's relative standard error from r² and its points (`slopeRelativeScale`). */
  scale?: number | null;
}

export interface BankStats {
  method: string;
  which: "vt1" | "vt2";
  noise: NoiseLevel | "all";
  n: number;
  medianPct: number;
  p90Pct: number;
  noCallPct: number;
  /** Share of all tests (no-calls count as misses) with error ≤ 5 %. */
  within5Pct: number;
  /** Consensus and slope only: share of the calls whose band holds the truth. */
  bandCoverPct?: number;
  /** Consensus and slope only: median band width as % of the value. */
  bandWidthPct?: number;
}

/** A synthetic test with its truth and noise level, as every model returns it. */
export interface BankCase {
  id: string;
  make: () => {
    table: Parameters<typeof conditionTable>[0];
    /** The same breaths without noise or artefacts. */
    noiseFree: Parameters<typeof conditionTable>[0];
    truth: SyntheticTruth;
    noise: NoiseLevel;
  };
}

/** A model written blind: test i of a bank drawn from its spec function with the bank's seed (seed + i generates). */
function blindModel(
  name: string,
  defaultSeed: number,
  make: (i: number, seed: number, levels: NoiseLevel[]) => ReturnType<BankCase["make"]>,
): (size: number, seed: number | undefined, levels: NoiseLevel[]) => BankCase[] {
  return (size, seed = defaultSeed, levels) =>
    Array.from({ length: size }, (_, i) => ({ id: `${name}-${i}`, make: () => make(i, seed, levels) }));
}

/**
 * The models a bank can draw from: the test cases for a size, seed and noise levels (default seed per model, as in the
 * committed bank test). "main" chose the settings, "variant" checks them; "holdout", "audit", "crosscheck" and "secondopinion" were written blind.
 */
const GENERATORS = {
  main: (size: number, seed = 2024, levels: NoiseLevel[]): BankCase[] =>
    syntheticBank(size, { seed, noiseLevels: levels }).map((c) => ({
      id: c.id,
      make: () => {
        const syn = generateSyntheticTest(c.spec, c.seed);
        return { table: syn.table, noiseFree: syn.noiseFree, truth: syn.truth, noise: syn.spec.noise };
      },
    })),
  variant: (size: number, seed = 77, levels: NoiseLevel[]): BankCase[] =>
    Array.from({ length: size }, (_, i) => ({
      id: `variant-${i}`,
      make: () => {
        const syn = generateVariantTest(variantSpec(i, seed, levels), 5000 + i);
        return { table: syn.table, noiseFree: syn.noiseFree, truth: syn.truth, noise: syn.variant.noise };
      },
    })),
  holdout: blindModel("holdout", 31, (i, seed, levels) => {
    const syn = generateHoldoutTest(holdoutSpec(i, seed, levels), seed + i);
    return { table: syn.table, noiseFree: syn.noiseFree, truth: syn.truth, noise: syn.holdout.noise };
  }),
  audit: blindModel("audit", 41, (i, seed, levels) => {
    const syn = generateAuditTest(auditSpec(i, seed, levels), seed + i);
    return { table: syn.table, noiseFree: syn.noiseFree, truth: syn.truth, noise: syn.audit.noise };
  }),
  crosscheck: blindModel("crosscheck", 53, (i, seed, levels) => {
    const syn = generateCrossCheckTest(crossCheckSpec(i, seed, levels), seed + i);
    return { table: syn.table, noiseFree: syn.noiseFree, truth: syn.truth, noise: syn.crossCheck.noise };
  }),
  secondopinion: blindModel("secondopinion", 67, (i, seed, levels) => {
    const syn = generateSecondOpinionTest(secondOpinionSpec(i, seed, levels), seed + i);
    return { table: syn.table, noiseFree: syn.noiseFree, truth: syn.truth, noise: syn.secondOpinion.noise };
  }),
};

export type BankGenerator = keyof typeof GENERATORS;

/** The test cases of one bank (generated lazily by `make`): the model, size, seed (default per model) and noise levels. */
export function bankCases(generator: BankGenerator, size: number, seed: number | undefined, levels: NoiseLevel[]): BankCase[] {
  return GENERATORS[generator](size, seed, levels);
}

/** A generator name from text (an env var or a screen set), "main" when it names none. */
export function bankGenerator(name: string | undefined): BankGenerator {
  return name !== undefined && name in GENERATORS ? (name as BankGenerator) : "main";
}

export interface BankOptions {
  size: number;
  seed?: number;
  binS?: number;
  bootstrap?: number;
  /**
   * "main" = generateSyntheticTest bank; "variant" = the independent validation model; "holdout", "audit" and
   * "crosscheck" = models written blind to the methods (measured on, never used alone to choose a setting). @default "main"
   */
  generator?: BankGenerator;
  /** Noise levels to run. @default ["low", "moderate", "high"] */
  noiseLevels?: NoiseLevel[];
  /** Report the calibrated band (false: the raw band, for `scripts/band-calibration.ts`). @default true */
  calibrateBand?: boolean;
  /** Lag-1 correlation given to the breath noise (`recolourNoise`; 0 = each model's own noise). @default 0 */
  noiseRho?: number;
}

/** The row of the VE/VCO2 slope to VT2 against the noise-free truth, with its band and scale. */
function slopeRow(id: string, noise: NoiseLevel, line: LineIndex, truth: number): BankRow {
  const v = line.slope.value;
  return {
    id,
    noise,
    which: "vt2",
    method: "ve-vco2-slope-to-vt2",
    errorPct: v === null ? null : (100 * Math.abs(v - truth)) / truth,
    value: v,
    truth,
    band: line.band ?? null,
    scale: slopeRelativeScale(line.r2.value, fittedPoints(line)),
  };
}

/** Run the bank and return one row per (test, threshold, method) plus the consensus rows. */
export function runThresholdBank(options: BankOptions): { rows: BankRow[]; stats: BankStats[]; ms: number } {
  const levels = options.noiseLevels ?? ["low", "moderate", "high"];
  const cases = bankCases(options.generator ?? "main", options.size, options.seed, levels);
  const rows: BankRow[] = [];
  const t0 = performance.now();
  for (const c of cases) {
    const syn = c.make();
    const test = conditionTable(options.noiseRho ? recolourNoise(syn.table, syn.noiseFree, options.noiseRho) : syn.table);
    const res = detectThresholds(test, {
      bootstrap: options.bootstrap ?? 0,
      seed: 1,
      series: { binS: options.binS ?? 20 },
      calibrateBand: options.calibrateBand ?? true,
    });
    const noise = syn.noise;
    // VE/VCO2 slope to the detected VT2 (lib/thresholds/veVco2Slope.ts) against the noise-free truth
    if (syn.truth.vt2 && res.vt2.timeS !== null && res.vt2.vo2MlMin.value !== null) {
      const line = veVco2Slope(test, { vt2: { timeS: res.vt2.timeS, vo2MlMin: res.vt2.vo2MlMin.value } }).slopeToVt2;
      rows.push(slopeRow(c.id, noise, line, syn.truth.veVco2SlopeToVt2));
    } else if (syn.truth.vt2) {
      // VT2 not found: the slope module still reports the whole-exercise slope when the test shows no compensation
      rows.push(slopeRow(c.id, noise, veVco2Slope(test, { vt2: null }).slopeToVt2, syn.truth.veVco2SlopeToVt2));
    }
    for (const which of ["vt1", "vt2"] as const) {
      const truth = syn.truth[which];
      if (!truth) continue;
      const err = (v: number | null) => (v === null ? null : (100 * Math.abs(v - truth.vo2MlMin)) / truth.vo2MlMin);
      rows.push({
        id: c.id,
        noise,
        which,
        method: `${which}-consensus`,
        errorPct: err(res[which].vo2MlMin.value),
        confidence: res[which].confidence,
        value: res[which].vo2MlMin.value,
        truth: truth.vo2MlMin,
        band: res[which].band ? { low: res[which].band.lowMlMin, high: res[which].band.highMlMin } : null,
      });
      for (const m of res.methods.filter((x) => x.which === which))
        rows.push({ id: c.id, noise, which, method: m.id, errorPct: err(m.vo2MlMin.value) });
    }
  }
  const ms = performance.now() - t0;
  const stats: BankStats[] = [];
  const methods = [...new Set(rows.map((r) => `${r.which}|${r.method}`))];
  for (const key of methods) {
    const [which, method] = key.split("|") as ["vt1" | "vt2", string];
    for (const noise of ["low", "moderate", "high", "all"] as const) {
      const sel = rows.filter((r) => r.which === which && r.method === method && (noise === "all" || r.noise === noise));
      if (sel.length === 0) continue;
      const errs = sel.filter((r) => r.errorPct !== null).map((r) => r.errorPct as number);
      const banded = sel.filter((r) => r.band && r.truth !== undefined && typeof r.value === "number");
      const held = banded.filter((r) => r.band!.low <= r.truth! && r.truth! <= r.band!.high).length;
      stats.push({
        method,
        which,
        noise,
        n: sel.length,
        medianPct: quantile(errs, 0.5),
        within5Pct: (100 * errs.filter((e) => e <= 5).length) / sel.length,
        p90Pct: quantile(errs, 0.9),
        noCallPct: (100 * (sel.length - errs.length)) / sel.length,
        ...(banded.length > 0
          ? {
              bandCoverPct: (100 * held) / banded.length,
              bandWidthPct: quantile(
                banded.map((r) => (100 * (r.band!.high - r.band!.low)) / (r.value as number)),
                0.5,
              ),
            }
          : {}),
      });
    }
  }
  return { rows, stats, ms };
}

function main(): void {
  const size = Number(process.env.BANK_SIZE ?? 240);
  const { stats, ms, rows } = runThresholdBank({
    size,
    seed: Number(process.env.BANK_SEED ?? 2024),
    binS: Number(process.env.BANK_BIN_S ?? 20),
    bootstrap: Number(process.env.BANK_BOOTSTRAP ?? 40),
    generator: bankGenerator(process.env.BANK_GENERATOR),
  });
  console.log(
    `threshold bank: ${size} synthetic tests (invented data), ${(ms / 1000).toFixed(1)} s, ${(ms / size).toFixed(1)} ms per test`,
  );
  console.log("method                          noise     n   median%  P90%   no-call%  ≤5%  band holds truth%");
  for (const s of stats) {
    console.log(
      `${s.method.padEnd(32)}${s.noise.padEnd(9)}${String(s.n).padStart(4)}${s.medianPct.toFixed(1).padStart(9)}${s.p90Pct.toFixed(1).padStart(7)}${s.noCallPct.toFixed(1).padStart(10)}${s.within5Pct.toFixed(0).padStart(6)}${s.bandCoverPct === undefined ? "" : s.bandCoverPct.toFixed(0).padStart(8)}`,
    );
  }
  const conf = rows.filter((r) => r.method.endsWith("consensus"));
  for (const which of ["vt1", "vt2"]) {
    const sel = conf.filter((r) => r.which === which);
    const by = (c: string) => sel.filter((r) => r.confidence === c).length;
    console.log(
      `${which} confidence: high ${by("high")}, moderate ${by("moderate")}, low ${by("low")}, not determinable ${by("not-determinable")}`,
    );
  }
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) main();
