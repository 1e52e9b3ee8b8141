export * from "./connection";
export * from "./enums";
export * from "./testing";
