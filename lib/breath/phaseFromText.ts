import type { Phase } from "./types";

/**
 * The phase a marker text names, if any: "Rest"/"baseline" → rest; "warm-up"/"unloaded" → warmup;
 * "exercise"/"ramp"/"load"/"incremental"/"start test" → exercise; "recovery"/"cool-down"/"end of
 * exercise" → recovery. Plain English forms of the trade (common practice); undefined otherwise.
 */
export function phaseFromText(text: string): Phase | undefined {
  const t = text.toLowerCase().replace(/[_-]+/g, " ").replace(/\s+/g, " ").trim();
  if (t.length === 0) return undefined;
  if (/\b(recovery|recover|cool ?down|post exercise|end (of )?(exercise|test|load)|stop (exercise|test))\b/.test(t))
    return "recovery";
  if (/\b(warm ?up|unloaded|free ?wheel(ing)?|reference)\b/.test(t)) return "warmup";
  if (/\b(rest|resting|baseline|pre ?test|sitting)\b/.test(t)) return "rest";
  if (/\b(exercise|exercising|ramp|incremental|loaded|load|test start|start (of )?(test|exercise|ramp|load))\b/.test(t))
    return "exercise";
  return undefined;
}
