export * from "./cliJson";
export * from "./caution";
