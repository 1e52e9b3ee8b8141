// Request and response schemas shared by the server and the portal. Only zod and the enum lists:
// nothing here may import server code (knex, express, node built-ins).
export * from "./enums";
export * from "./common";
export * from "./sessions";
export * from "./patients";
export * from "./trends";
export * from "./notes";
export * from "./training";
export * from "./research";
