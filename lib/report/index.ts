export * from "./cliJson";
export * from "./caution";
export * from "./sources";
export * from "./analysisCharts";
export * from "./reportModel";
export * from "./buildReportModel";
export * from "./initialDraftSections";
export * from "./charts";
