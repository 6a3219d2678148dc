export * from "./issue";
export * from "./source";
export * from "./measured";
export * from "./patient";
export * from "./sources";
export * from "./cautions";
export * from "./plausibleLimits";
