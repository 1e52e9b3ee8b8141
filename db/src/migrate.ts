import { createDb, databaseUrl } from "./connection";

// `npm run migrate -w db [-- down]`: latest by default, `down` rolls back every batch. Runs as the
// tables' owner (MIGRATION_DATABASE_URL) when that is set: the application's own role
// (DATABASE_URL) may not change the schema.
const db = createDb(process.env.MIGRATION_DATABASE_URL || databaseUrl());
try {
  if (process.argv.includes("down")) {
    await db.migrate.rollback(undefined, true);
    console.log("migrations rolled back");
  } else {
    const [batch, files] = await db.migrate.latest();
    console.log(files.length ? `migrated batch ${batch}: ${files.join(", ")}` : "schema up to date");
  }
} finally {
  await db.destroy();
}
