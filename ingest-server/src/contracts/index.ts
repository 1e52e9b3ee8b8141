// Request and response schemas shared by the server and the portal. Only zod, the enum lists and the
// metric catalogue: nothing here may import server code (knex, express, node built-ins).
export * from "./enums";
export * from "./common";
export * from "./auth";
export * from "./me";
export * from "./users";
export * from "./invitations";
export * from "./devices";
export * from "./audit";
export * from "./mailbox";
export * from "./sessions";
export * from "./patients";
export * from "./trends";
export * from "./notes";
export * from "./training";
export * from "./research";
export * from "./caseload-links";
export * from "./consent";
export * from "./metrics";
