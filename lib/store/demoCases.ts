import type { Ergometer, Patient, Spirometry } from "../core";
import type { ReferralQuestion } from "../analysis";

/**
 * INVENTED demo cases (not patient data). Generated deterministically so the demo is the same on
 * every machine.
 */
export interface DemoCase {
  label: string;
  fileName: string;
  patient: Patient;
  ergometer: Ergometer;
  referral: ReferralQuestion;
  spirometry?: Spirometry;
  csv: () => string;
}

function mulberry32(seed: number) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Simple invented ramp test: rest 120 s, unloaded 120 s, ramp to `peakW`, recovery 120 s. */
function simpleRamp(seed: number, rampWPerMin: number, peakW: number, restVo2: number, slope: number): string {
  const rnd = mulberry32(seed);
  const lines = ["time_s,vo2_ml_min,vco2_ml_min,ve_l_min,hr_bpm,work_w,phase"];
  const rampS = (peakW / rampWPerMin) * 60;
  const end = 240 + rampS + 120;
  let vo2 = restVo2;
  for (let t = 0; t < end; t += 2.5 + rnd()) {
    const phase = t < 120 ? "rest" : t < 240 ? "warmup" : t < 240 + rampS ? "exercise" : "recovery";
    const work = phase === "exercise" ? ((t - 240) / 60) * rampWPerMin : 0;
    const target = phase === "rest" ? restVo2 : phase === "recovery" ? restVo2 * 1.6 : restVo2 * 1.5 + slope * work;
    vo2 += (target - vo2) * 0.08;
    const noisy = vo2 * (1 + (rnd() - 0.5) * 0.08);
    const rer = 0.82 + 0.3 * Math.max(0, (work - peakW * 0.5) / peakW);
    const vco2 = noisy * rer;
    const ve = (vco2 / 1000) * 28 + 3;
    const hr = 70 + (noisy - restVo2) * 0.045;
    lines.push([t.toFixed(2), noisy.toFixed(0), vco2.toFixed(0), ve.toFixed(1), hr.toFixed(0), work.toFixed(0), phase].join(","));
  }
  return lines.join("\n") + "\n";
}

export const DEMO_CASES: DemoCase[] = [
  {
    label: "Demo (invented): healthy adult, cycle ramp",
    fileName: "demo-healthy-ramp.csv",
    patient: { sex: "male", ageY: 45, heightCm: 178, weightKg: 78 },
    ergometer: "cycle",
    referral: "general",
    spirometry: { fev1L: 3.6 },
    csv: () => simpleRamp(11, 25, 250, 320, 10),
  },
];
