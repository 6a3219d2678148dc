export * from "./sources";
export * from "./peak";
