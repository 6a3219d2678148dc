export * from "./types";
export * from "./analyse";
export * from "./buildRecord";
export * from "./draftExtras";
export * from "./checkThresholdOverride";
