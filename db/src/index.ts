export * from "./connection";
export * from "./enums";
export * from "./testing";
export * from "./app-role";
