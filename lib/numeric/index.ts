export * from "./linearRegression";
export * from "./seededRandom";
export * from "./quantile";
export * from "./runningMedian";
export * from "./binByTime";
export * from "./solveLinearSystem";
export * from "./hingeFit";
export * from "./twoLineFit";
