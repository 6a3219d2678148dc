import { defineSources } from "../core/source";

export const THRESHOLD_SOURCES = defineSources({
  "peak-rolling-average": {
    citation: "Highest 20-30 s average of VO2 near end-exercise as peak VO2 (common practice; survey: Robergs, Dwyer & Astorino 2010, Sports Med 40:95)",
    status: "common-practice",
  },
});
