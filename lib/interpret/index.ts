export * from "./types";
export * from "./variables";
export { interpret, makeContext } from "./interpret";
export {
  composeDraft,
  conclusionLead,
  ATRIAL_FIBRILLATION_HR_NOTE,
  BETA_BLOCKER_HR_NOTE,
  BETA_BLOCKER_HR_REACHED_NOTE,
  BETA_BLOCKER_ONE_SIDED,
  heartRateNotes,
  hrReserveNote,
  DRAFT_BANNER,
  COMPOSED_TEXT_CAUTION,
  type DraftExtras,
  type DraftReport,
  type DraftSection,
  type IntensityDomain,
} from "./composeDraft";
export { compareTests, SERIAL_VARIABLES, type NoiseBand, type SerialComparison, type SerialItem } from "./compareTests";
export { listCutoffChoices } from "./listCutoffChoices";
export { peakVo2ReducedLimit, type PeakVo2ReducedLimit } from "./peakVo2Limit";
export {
  INTERPRETATION_DATA,
  parseInterpretationData,
  type InterpretationData,
  type RawInterpretationData,
} from "./interpretationData";
export { INTERPRET_SOURCES } from "./sources";
export { UNCOMBINED_SCHEME_TEXT } from "./applySchemes";
export { lowerFirst, nearCutoffNote } from "./format";
