export * from "./icons";
