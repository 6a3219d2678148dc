/** What must have been checked before VO2-based values are read despite an implausible ΔVO2/ΔWR (common practice). */
export const VO2_CHECKS = {
  gas: "gas analyser calibration",
  flow: "flow or volume calibration",
  mask: "mask fit and seal during the test (observed, or a leak test before and after)",
  work: "the ergometer's work-rate record",
} as const;
