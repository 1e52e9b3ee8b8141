export * from "./badge";
export * from "./button";
export * from "./clinical-notice";
export * from "./field";
export * from "./page-header";
export * from "./spinner";
export * from "./states";
export * from "./table";
