export * from "./types";
export * from "./rollingTimeAverage";
export * from "./conditionTable";
