export * from "./types";
export * from "./importBreathFile";
