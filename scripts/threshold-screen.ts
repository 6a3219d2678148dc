/**
 * Screening of threshold-method changes on several synthetic banks at one noise level (invented data, truth known by
 * construction). Run: `npx tsx scripts/threshold-screen.ts` — SCREEN_SETS (default
 * "main:2024,main:99,main:5,variant:2024,variant:77,variant:99"; "holdout:<seed>", "audit:<seed>", "crosscheck:<seed>" and "secondopinion:<seed>" add the models
 * written blind to the methods — measure on them, never choose a setting on them alone), SCREEN_SIZE (tests per bank, default 240),
 * SCREEN_NOISE (low | moderate | high, default moderate), SCREEN_BOOTSTRAP (resamples, default 20), SCREEN_RHO (lag-1
 * correlation given to the breath noise by `recolourNoise`, default 0 = each model's own noise).
 * Prints per bank the VT1 consensus and joint-profile median / P90 / no-call %, VT2 and the VE/VCO2 slope hits, how
 * often the band holds the true VT1 and VT2, then the mean over banks. The mean of six 240-test banks moves by about
 * ±0.2 points between equivalent settings (README-thresholds.md, round 7): read smaller differences as noise.
 */
import { pathToFileURL } from "node:url";
import type { NoiseLevel } from "../lib/synthetic";
import { bankGenerator, runThresholdBank, type BankGenerator } from "./threshold-bank";

export interface ScreenLine {
  bank: string;
  vt1: { medianPct: number; p90Pct: number; noCallPct: number; bandCoverPct: number };
  joint: { medianPct: number; p90Pct: number };
  vt2: { medianPct: number; p90Pct: number; noCallPct: number; bandCoverPct: number };
  slopeWithin5Pct: number;
}

export function screenBanks(
  sets: { generator: BankGenerator; seed: number }[],
  size: number,
  noise: NoiseLevel,
  bootstrap: number,
  noiseRho = 0,
): ScreenLine[] {
  return sets.map(({ generator, seed }) => {
    const { stats } = runThresholdBank({ size, seed, bootstrap, generator, noiseLevels: [noise], noiseRho });
    const get = (m: string) => stats.find((s) => s.method === m && s.noise === "all");
    const v1 = get("vt1-consensus");
    const j = get("vt1-joint-profile");
    const v2 = get("vt2-consensus");
    const sl = get("ve-vco2-slope-to-vt2");
    return {
      bank: `${generator}:${seed}`,
      vt1: {
        medianPct: v1?.medianPct ?? NaN,
        p90Pct: v1?.p90Pct ?? NaN,
        noCallPct: v1?.noCallPct ?? NaN,
        bandCoverPct: v1?.bandCoverPct ?? NaN,
      },
      joint: { medianPct: j?.medianPct ?? NaN, p90Pct: j?.p90Pct ?? NaN },
      vt2: {
        medianPct: v2?.medianPct ?? NaN,
        p90Pct: v2?.p90Pct ?? NaN,
        noCallPct: v2?.noCallPct ?? NaN,
        bandCoverPct: v2?.bandCoverPct ?? NaN,
      },
      slopeWithin5Pct: sl?.within5Pct ?? NaN,
    };
  });
}

function main(): void {
  const sets = (process.env.SCREEN_SETS ?? "main:2024,main:99,main:5,variant:2024,variant:77,variant:99").split(",").map((s) => {
    const [g, seed] = s.split(":");
    return { generator: bankGenerator(g), seed: Number(seed) };
  });
  const size = Number(process.env.SCREEN_SIZE ?? 240);
  const noise = (process.env.SCREEN_NOISE ?? "moderate") as NoiseLevel;
  const bootstrap = Number(process.env.SCREEN_BOOTSTRAP ?? 20);
  const rho = Number(process.env.SCREEN_RHO ?? 0);
  const t0 = performance.now();
  const lines = screenBanks(sets, size, noise, bootstrap, rho);
  const f = (x: number) => x.toFixed(2);
  console.log(
    `threshold screen: ${sets.length} banks × ${size} tests (invented data), ${noise} noise${rho ? ` re-coloured to lag-1 correlation ${rho}` : ""}, ${bootstrap} resamples`,
  );
  for (const l of lines)
    console.log(
      `${l.bank.padEnd(13)} VT1 ${f(l.vt1.medianPct)} / ${f(l.vt1.p90Pct)} / ${l.vt1.noCallPct.toFixed(1)}  joint ${f(l.joint.medianPct)} / ${f(l.joint.p90Pct)}  VT2 ${f(l.vt2.medianPct)} / ${f(l.vt2.p90Pct)} / ${l.vt2.noCallPct.toFixed(1)}  slope ±5 % ${l.slopeWithin5Pct.toFixed(1)}  band holds VT1 ${l.vt1.bandCoverPct.toFixed(0)} %, VT2 ${l.vt2.bandCoverPct.toFixed(0)} %`,
    );
  const mean = (g: (l: ScreenLine) => number) => lines.reduce((a, l) => a + g(l), 0) / lines.length;
  console.log(
    `mean over banks: VT1 median ${f(mean((l) => l.vt1.medianPct))}, P90 ${f(mean((l) => l.vt1.p90Pct))}; VT2 median ${f(mean((l) => l.vt2.medianPct))}; slope ±5 % ${mean((l) => l.slopeWithin5Pct).toFixed(1)} (${((performance.now() - t0) / 1000).toFixed(0)} s)`,
  );
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) main();
