export * from "./linearRegression";
