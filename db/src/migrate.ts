import { createDb } from "./connection";

// `npm run migrate -w db [-- down]`: latest by default, `down` rolls back every batch.
const db = createDb();
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
