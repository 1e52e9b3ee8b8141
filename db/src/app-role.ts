import type { Knex } from "knex";

/**
 * The application's own database role. The server and the workers connect as it (DATABASE_URL);
 * migrations and the queue's schema set-up run as the role that owns the tables
 * (MIGRATION_DATABASE_URL, the cluster's superuser in `npm start`). The application role may read
 * and write rows and nothing else: no DDL, no superuser programs (`COPY … TO PROGRAM`), no other
 * database, no migration bookkeeping, no rewriting of the audit trail.
 */
export interface AppRole {
  name: string;
  password: string;
}

/** Rows only: what the server and workers do with every table of the app's schemas. */
const TABLE_PRIVILEGES = "SELECT, INSERT, UPDATE, DELETE";
const SEQUENCE_PRIVILEGES = "USAGE, SELECT, UPDATE";
/** Tables the application role never touches, or only appends to. */
const MIGRATION_TABLES = ["knex_migrations", "knex_migrations_lock"];
const APPEND_ONLY_TABLES = ["audit_events"];

export function quoteIdent(name: string): string {
  return `"${name.replace(/"/g, '""')}"`;
}

export function quoteLiteral(value: string): string {
  if (value.includes("\0")) throw new RangeError("a SQL literal cannot hold a NUL character");
  return `'${value.replace(/'/g, "''")}'`;
}

/** Role name and password from a postgres:// URL; undefined when it names no user. */
export function roleFromUrl(url: string): AppRole | undefined {
  const u = new URL(url);
  if (!u.username) return undefined;
  return { name: decodeURIComponent(u.username), password: decodeURIComponent(u.password) };
}

/**
 * Creates the role when missing, or resets it to a plain login role (in case someone widened it),
 * with the given password. Needs CREATEROLE or superuser on `admin`'s connection.
 */
export async function ensureAppRole(admin: Knex, role: AppRole): Promise<void> {
  const ident = quoteIdent(role.name);
  const attributes = `LOGIN NOSUPERUSER NOCREATEDB NOCREATEROLE NOREPLICATION NOBYPASSRLS NOINHERIT PASSWORD ${quoteLiteral(role.password)}`;
  const exists = await admin.raw("SELECT 1 FROM pg_roles WHERE rolname = ?", [role.name]);
  await admin.raw(`${exists.rows.length ? "ALTER" : "CREATE"} ROLE ${ident} WITH ${attributes}`);
  // Membership in any role (pg_execute_server_program, pg_read_server_files, an owner…) would
  // hand its rights over; the application role is a member of none.
  const memberships = await admin.raw(
    "SELECT r.rolname FROM pg_auth_members m JOIN pg_roles r ON r.oid = m.roleid JOIN pg_roles u ON u.oid = m.member WHERE u.rolname = ?",
    [role.name],
  );
  for (const { rolname } of memberships.rows as { rolname: string }[]) {
    await admin.raw(`REVOKE ${quoteIdent(rolname)} FROM ${ident}`);
  }
}

/**
 * Grants the application role what it needs in `admin`'s current database and nothing more.
 * Idempotent; run after every migration (default privileges cover tables created later by the
 * same owner, e.g. a restore or a queue partition).
 */
export async function grantAppRole(admin: Knex, roleName: string, schemas: readonly string[]): Promise<void> {
  const role = quoteIdent(roleName);
  const { rows } = await admin.raw("SELECT current_database() AS db");
  const db = quoteIdent((rows[0] as { db: string }).db);
  await admin.raw(`REVOKE ALL ON DATABASE ${db} FROM PUBLIC`);
  await admin.raw(`GRANT CONNECT ON DATABASE ${db} TO ${role}`);
  await admin.raw(`REVOKE CREATE ON SCHEMA public FROM PUBLIC`);
  for (const name of schemas) {
    const schema = quoteIdent(name);
    await admin.raw(`REVOKE CREATE ON SCHEMA ${schema} FROM ${role}`);
    await admin.raw(`GRANT USAGE ON SCHEMA ${schema} TO ${role}`);
    await admin.raw(`GRANT ${TABLE_PRIVILEGES} ON ALL TABLES IN SCHEMA ${schema} TO ${role}`);
    await admin.raw(`GRANT ${SEQUENCE_PRIVILEGES} ON ALL SEQUENCES IN SCHEMA ${schema} TO ${role}`);
    await admin.raw(`ALTER DEFAULT PRIVILEGES IN SCHEMA ${schema} GRANT ${TABLE_PRIVILEGES} ON TABLES TO ${role}`);
    await admin.raw(`ALTER DEFAULT PRIVILEGES IN SCHEMA ${schema} GRANT ${SEQUENCE_PRIVILEGES} ON SEQUENCES TO ${role}`);
  }
  for (const table of MIGRATION_TABLES) {
    if (await admin.schema.hasTable(table)) await admin.raw(`REVOKE ALL ON ${quoteIdent(table)} FROM ${role}`);
  }
  for (const table of APPEND_ONLY_TABLES) {
    if (await admin.schema.hasTable(table)) await admin.raw(`REVOKE UPDATE, DELETE, TRUNCATE ON ${quoteIdent(table)} FROM ${role}`);
  }
}
