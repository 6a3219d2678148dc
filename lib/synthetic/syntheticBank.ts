import { seededRandom } from "../numeric";
import type { NoiseLevel, SyntheticSpec } from "./syntheticTypes";

export interface BankCase {
  id: string;
  spec: Partial<SyntheticSpec>;
  seed: number;
}

export interface SyntheticBankOptions {
  /** Noise levels to cycle through. @default ["low", "moderate", "high"] */
  noiseLevels?: NoiseLevel[];
  /** Seed of the bank's own draws. @default 2024 */
  seed?: number;
}

/**
 * A varied bank of synthetic test specs (invented data) for accuracy checks of threshold methods:
 * peak VO2 900–4200 mL/min, VT1 at 40–70 % (and ≥ unloaded VO2 + 12 % of peak) and VT2 at 70–90 % of peak (VT2 ≥ VT1 + 12 points), ramps
 * 10–30 W/min, S1 0.88–1.02, S2 1.2–1.5, VE/VCO2 slope 22–45, VO2 time constant 25–75 s, VCO2 extra lag
 * 0–25 s, VE lag 0–15 s, slow component, plateaus, autocorrelated noise, artefacts and EOV in some cases.
 * Noise levels cycle so each level gets an equal share.
 */
export function syntheticBank(size: number, options: SyntheticBankOptions = {}): BankCase[] {
  const levels = options.noiseLevels ?? ["low", "moderate", "high"];
  const rng = seededRandom(options.seed ?? 2024);
  const u = (lo: number, hi: number) => lo + (hi - lo) * rng.uniform();
  const out: BankCase[] = [];
  for (let i = 0; i < size; i++) {
    const noise = levels[i % levels.length];
    const weightKg = u(55, 100);
    const peakPerKg = u(14, 50);
    const peakVo2MlMin = Math.min(4200, Math.max(900, peakPerKg * weightKg));
    const vo2RestMlMin = 3.5 * weightKg * u(0.9, 1.15);
    const vo2UnloadedMlMin = vo2RestMlMin + u(150, 330);
    // VT1 lies above unloaded VO2 by at least 12 % of peak (an AT below unloaded pedalling is not physiological)
    const vt1 = Math.min(0.7, Math.max(u(0.4, 0.7), vo2UnloadedMlMin / peakVo2MlMin + 0.12));
    const vt2 = Math.min(0.9, Math.max(u(0.7, 0.9), vt1 + 0.12));
    const fit = peakPerKg > 30;
    const spec: Partial<SyntheticSpec> = {
      label: `bank-${i}`,
      weightKg,
      peakVo2MlMin,
      vo2RestMlMin,
      vo2UnloadedMlMin,
      warmupW: Math.round(u(0, 20)),
      rampWPerMin: Math.round(u(10, 30) / (fit ? 1 : 1.6)),
      gainMlMinPerW: u(8.3, 11.5),
      tauVo2S: u(25, 75),
      slowComponentFraction: rng.uniform() < 0.3 ? u(0.03, 0.12) : 0,
      plateau: rng.uniform() < 0.2,
      vt1FractionOfPeak: vt1,
      vt2FractionOfPeak: vt2,
      rerRest: u(0.76, 0.88),
      s1: u(0.88, 1.02),
      s2: u(1.2, 1.5),
      tauCo2ExtraS: u(0, 25),
      veInterceptLMin: u(1.5, 5),
      veVco2Slope: u(22, 45),
      hyperventilationSlope: u(10, 30),
      tauVeS: u(0, 15),
      hrRestBpm: u(55, 95),
      hrPeakBpm: u(130, 195),
      noise,
      noiseAutocorrelation: rng.uniform() < 0.4 ? u(0.2, 0.6) : 0,
      artefactRate: rng.uniform() < 0.3 ? u(0.005, 0.03) : 0,
      eov: rng.uniform() < 0.08 ? { periodS: u(40, 90), amplitudeFraction: u(0.1, 0.25) } : null,
    };
    out.push({ id: `bank-${i}`, spec, seed: 1000 + i });
  }
  return out;
}
