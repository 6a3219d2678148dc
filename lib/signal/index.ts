export * from "./types";
export * from "./sources";
export * from "./rollingTimeAverage";
export * from "./rejectArtefacts";
export * from "./averageSeries";
export * from "./resampleToGrid";
export * from "./detectPhases";
export * from "./conditionTable";
