export * from "./connection";
export * from "./enums";
