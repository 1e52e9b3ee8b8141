import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { createDb, createTestDatabase, type TestDatabase } from "../src";

const NAME = "20261203100000_consent_events_research_projects";
let tdb: TestDatabase;
let db: Knex;

beforeAll(async () => {
  tdb = await createTestDatabase("db_consent");
  db = createDb(tdb.url);
});
afterAll(async () => {
  await db?.destroy();
  await tdb?.drop();
});

async function patient(researchId: string, consent: boolean) {
  const [row] = await db("patients")
    .insert({ display_name: "Test Person", research_id: researchId, birth_year: 1960, sex: "female", condition: "stroke", enrolled_on: "2026-01-05", research_consent: consent })
    .returning("id");
  return row.id as string;
}

describe(`migration ${NAME}`, () => {
  it("turns the old yes/no flag into 'given' events by 'migration' that do not count, and rolls back cleanly", async () => {
    await db.migrate.down({ name: NAME });
    const yes = await patient("MIG-1", true);
    const no = await patient("MIG-2", false);
    expect((await db("patients").where({ id: yes }).first("research_consent")).research_consent).toBe(true);

    await db.migrate.up({ name: NAME });
    const events = await db("consent_events").select("patient_id", "kind", "recorder_role", "counts", "recorded_by");
    expect(events).toEqual([{ patient_id: yes, kind: "given", recorder_role: "migration", counts: false, recorded_by: null }]);
    const flags = await db("patients").whereIn("id", [yes, no]).orderBy("research_id").pluck("research_consent");
    expect(flags).toEqual([false, false]);

    // The patient's own confirmation counts and the cache follows it; a new patient row never starts with consent.
    await db("consent_events").insert({ patient_id: yes, kind: "given", recorder_role: "patient", counts: true });
    expect((await db("patients").where({ id: yes }).first("research_consent")).research_consent).toBe(true);
    const fresh = await patient("MIG-3", true);
    expect((await db("patients").where({ id: fresh }).first("research_consent")).research_consent).toBe(false);

    await db.migrate.down({ name: NAME });
    const tables = await db.raw("SELECT count(*)::int AS n FROM information_schema.tables WHERE table_name IN ('consent_events', 'research_projects')");
    expect(tables.rows[0].n).toBe(0);
    await db.migrate.up({ name: NAME });
  });

  it("an admin's event needs a reason of 10 characters; project salts are 32 bytes", async () => {
    const pid = await patient("MIG-4", false);
    await expect(db("consent_events").insert({ patient_id: pid, kind: "given", recorder_role: "admin", counts: true, reason: "short" })).rejects.toThrow(/consent_events_admin_reason/);
    const [u] = await db("users").insert({ email: "res@example.test", display_name: "R", role: "researcher" }).returning("id");
    await expect(db("research_projects").insert({ name: "Study", owner_id: u.id, key_salt: Buffer.alloc(16) })).rejects.toThrow(/research_projects_salt_length/);
  });
});
