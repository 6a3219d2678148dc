import { readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import type { InterpretInput } from "../../lib/interpret";

/** Load an invented fixture (tests/interpret/fixtures/*.json); every fixture is labelled invented. */
export function loadFixture(name: string): { invented: true; description: string; input: InterpretInput } {
  const path = fileURLToPath(new URL(`./fixtures/${name}.json`, import.meta.url));
  const fx = JSON.parse(readFileSync(path, "utf8"));
  if (fx.invented !== true) throw new Error(`fixture ${name} is not labelled invented`);
  return fx;
}

/** INVENTED minimal input: a maximal test with nothing abnormal, to be overridden per test. */
export function baseInput(overrides: Partial<InterpretInput["values"]> = {}, rest: Partial<InterpretInput> = {}): InterpretInput {
  return {
    patient: { sex: "male", ageY: 50, heightCm: 175, weightKg: 80, betaBlocker: false, haemoglobinGDl: 15 },
    referral: "general",
    values: {
      peakRer: 1.15,
      hrPctPred: 95,
      hrReserveBpm: 8,
      peakVo2PctPred: 95,
      peakVo2MlKgMin: 32,
      vt1PctPredPeakVo2: 50,
      vt1Vo2MlKgMin: 17,
      o2PulsePctPred: 100,
      o2PulsePlateau: false,
      dVo2dWr: 10.3,
      veVco2SlopeWhole: 27,
      veMvvPct: 65,
      spo2Fall: 1,
      spo2Min: 97,
      ...overrides,
    },
    ...rest,
  };
}

export function deepFreeze<T>(o: T): T {
  if (o && typeof o === "object") {
    Object.freeze(o);
    for (const v of Object.values(o)) deepFreeze(v);
  }
  return o;
}
