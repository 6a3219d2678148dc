export * from "./syntheticTypes";
export * from "./sources";
export * from "./generateSyntheticTest";
export * from "./syntheticPresets";
export * from "./syntheticBank";
export * from "./breathTableToCsv";
export * from "./generateVariantTest";
export * from "./generateHoldoutTest";
