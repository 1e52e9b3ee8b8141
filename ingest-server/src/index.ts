// Public surface of @pendula/ingest-server for the worker, tests and scripts (server-only code).
export { createApp, listEndpoints, type AppDeps, type CreateAppOptions } from "./app";
export { loadConfig, ConfigError, type Config } from "./config/env";
export { createRuntime, type Runtime } from "./runtime";
export { HttpError } from "./http-error";
export { ApiRouter, type RouteModule, type EndpointRecord, type Access } from "./http/api-router";
export { ROUTE_TABLE } from "./routes";
export { ROLE_SCOPES, SCOPES, type Scope } from "./auth/scopes";
export { assertPatientAccess, type PatientAccessMode } from "./auth/patient-access";
export { audit, type AuditEntry } from "./audit/audit";
export { S3ObjectStorage, ObjectNotFoundError, type ObjectStorage } from "./storage/object-storage";
export { SmtpMailer, type Mailer, type MailMessage } from "./mail/mailer";
export { PgBossQueue, QUEUES, type JobQueue, type QueueJob } from "./queue/queue";
