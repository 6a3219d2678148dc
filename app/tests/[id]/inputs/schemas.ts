import { z } from "zod";
import { optionalNumber, recordId } from "../../../schemas";
import { APPARATUS_DEAD_SPACE_LIMITS_ML, BAROMETRIC_PRESSURE_LIMITS_MMHG } from "@/lib/thresholds";

const formNumber = (min: number, max: number, what: string, integer = false) =>
  optionalNumber(min, max, what, { integer, decimalComma: true });

const yesNo = z.enum(["", "yes", "no"]).default("");
const text = (max: number, what: string) =>
  z.string().trim().max(max, `${what}: at most ${max} characters`).optional().default("");

/**
 * Clinical context and the patient details that change interpretation. Ranges are generous plausibility
 * limits (common practice): 19 bronchopulmonary segments is the count used for predicted postoperative
 * lung function (common practice); stair climb height 0–200 m; shuttle walk distance 0–3000 m;
 * haemoglobin 3–25 g/dL.
 */
export const contextSchema = z.object({
  testId: recordId("test"),
  ischaemicHeartDisease: yesNo,
  resectedSegments: formNumber(0, 19, "Segments to be resected", true),
  stairClimbM: formNumber(0, 200, "Stair climb height (m)"),
  shuttleWalkM: formNumber(0, 3000, "Shuttle walk distance (m)"),
  betaBlocker: yesNo,
  atrialFibrillation: yesNo,
  haemoglobinGDl: formNumber(3, 25, "Haemoglobin (g/dL)"),
});

/**
 * Test conduct. Peak rating of perceived exertion on Borg's 6–20 scale (Borg GA, 1982, Med Sci Sports Exerc;
 * recalled), whole numbers. Apparatus dead space within `APPARATUS_DEAD_SPACE_LIMITS_ML` (0–500 mL, our choice). Free
 * text is length-limited only.
 */
export const conductSchema = z.object({
  testId: recordId("test"),
  protocol: text(200, "Protocol"),
  reasonForStopping: text(300, "Reason for stopping"),
  symptoms: text(300, "Symptoms"),
  peakBorg: formNumber(6, 20, "Peak Borg rating (6–20)", true),
  bloodPressure: text(120, "Blood pressure"),
  ecgNotes: text(500, "ECG notes"),
  notes: text(1000, "Notes"),
  apparatusDeadSpaceMl: formNumber(
    APPARATUS_DEAD_SPACE_LIMITS_ML.min,
    APPARATUS_DEAD_SPACE_LIMITS_ML.max,
    "Apparatus dead space (mL)",
  ),
  barometricPressureMmHg: formNumber(
    BAROMETRIC_PRESSURE_LIMITS_MMHG.min,
    BAROMETRIC_PRESSURE_LIMITS_MMHG.max,
    "Barometric pressure (mmHg)",
  ),
});

export const fileFormSchema = z.object({
  testId: recordId("test"),
  timeUnit: z.enum(["s", "min"]).default("s"),
  /** Lactate only: the unit of a lactate column whose header names none ("" = read it from the header or the values). */
  lactateUnit: z.enum(["", "mmol/L", "mg/dL"]).default(""),
});
