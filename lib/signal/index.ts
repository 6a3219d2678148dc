export * from "./rollingTimeAverage";
