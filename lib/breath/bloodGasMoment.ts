import type { BloodGasSample } from "./types";

/**
 * The moment of the test a blood-gas label names:
 * - `rest`: at rest before exercise;
 * - `warmup`: during unloaded pedalling / warm-up;
 * - `peak`: at peak exercise, i.e. at the end of the incremental exercise;
 * - `recovery`: after exercise;
 * - `stage`: at (the end of) stage `stage` of a stage protocol.
 */
export type BloodGasMoment =
  { kind: "rest" } | { kind: "warmup" } | { kind: "peak" } | { kind: "recovery" } | { kind: "stage"; stage: number };

/** Plain words for a moment, e.g. "peak exercise", "stage 3". */
export function bloodGasMomentWords(m: BloodGasMoment): string {
  switch (m.kind) {
    case "rest":
      return "rest";
    case "warmup":
      return "warm-up";
    case "peak":
      return "peak exercise";
    case "recovery":
      return "recovery";
    case "stage":
      return `stage ${m.stage}`;
  }
}

const RECOVERY = /\b(recovery|recov|rec|post|post exercise|after exercise|cool ?down|erholung|nachbelastung)\b/;
const PEAK =
  /\b(peak|max|maximal|maximum|vo2 ?max|vo2 ?peak|exhaustion|end ?ex|end (of )?(exercise|ex|load|ramp|effort)|exercise end|belastungsende|ausbelastung)\b/;
const WARMUP = /\b(warm ?up|unloaded|free ?wheel(ing)?|0 ?w|leerlauf)\b/;
const REST = /\b(rest|resting|baseline|pre|pre exercise|pre test|before exercise|sitting|seated|ruhe)\b/;
const STAGE = /\b(?:stage|step|level|stufe)\s*(\d{1,3})\b/;

/**
 * The moment a blood-gas sample's label names, or undefined when it names none. English words of the trade and a few
 * German ones (common practice): "rest", "resting", "baseline", "pre(-exercise)" → rest; "warm-up", "unloaded",
 * "0 W" → warm-up; "peak", "max", "end of exercise", "end-ex", "exhaustion" → peak; "recovery", "post(-exercise)",
 * "rec 3 min" → recovery; "stage 3", "step 3", "level 3" → stage 3. Recovery words are checked first ("post peak" is
 * recovery), then peak, stage, warm-up and rest. A bare "exercise" names no moment (it does not say when).
 */
export function bloodGasMoment(label: string | undefined): BloodGasMoment | undefined {
  if (!label) return undefined;
  const t = label
    .toLowerCase()
    .replace(/[_\-.,;:/()]+/g, " ")
    .replace(/\s+/g, " ")
    .trim();
  if (t.length === 0) return undefined;
  if (RECOVERY.test(t)) return { kind: "recovery" };
  if (PEAK.test(t)) return { kind: "peak" };
  const stage = STAGE.exec(t);
  if (stage) return { kind: "stage", stage: Number(stage[1]) };
  if (WARMUP.test(t)) return { kind: "warmup" };
  if (REST.test(t)) return { kind: "rest" };
  return undefined;
}

/**
 * A blood-gas sample's time in seconds, or undefined when the file gave none. A sample without a time is stored with
 * `timeS` NaN (null once the record went through JSON); it is placed by its label at analysis (`bloodGasMoment`).
 */
export function bloodGasTimeS(sample: BloodGasSample): number | undefined {
  const t = sample.timeS as number | null | undefined;
  return typeof t === "number" && Number.isFinite(t) ? t : undefined;
}
