export * from "./jobs";
export * from "./messages";
export * from "./select-recipients";
