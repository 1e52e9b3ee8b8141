import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { createDb, createTestDatabase, type TestDatabase } from "../src";

let tdb: TestDatabase;
let db: Knex;

beforeAll(async () => {
  tdb = await createTestDatabase("db_schema");
  db = createDb(tdb.url);
});
afterAll(async () => {
  await db?.destroy();
  await tdb?.drop();
});

async function patient(researchId: string) {
  const [row] = await db("patients")
    .insert({ display_name: "Test Person", research_id: researchId, birth_year: 1960, sex: "female", condition: "stroke", enrolled_on: "2026-01-05" })
    .returning("id");
  return row.id as string;
}

describe("schema constraints", () => {
  it("rejects an overlapping assignment of the same device", async () => {
    const p1 = await patient("R-OVL-1");
    const p2 = await patient("R-OVL-2");
    const [dev] = await db("devices").insert({ serial: "TST-0001", kind: "imu6", firmware: "1.0" }).returning("id");
    await db("device_assignments").insert({ device_id: dev.id, patient_id: p1, placement: "left_shank", valid_from: "2026-01-01T00:00:00Z", valid_to: "2026-02-01T00:00:00Z" });
    await expect(
      db("device_assignments").insert({ device_id: dev.id, patient_id: p2, placement: "left_shank", valid_from: "2026-01-15T00:00:00Z" }),
    ).rejects.toThrow(/device_assignments_no_device_overlap/);
    // Touching ranges are not an overlap: the range is half-open.
    await db("device_assignments").insert({ device_id: dev.id, patient_id: p2, placement: "left_shank", valid_from: "2026-02-01T00:00:00Z" });
  });

  it("rejects two devices on one placement of one patient at the same time", async () => {
    const p = await patient("R-PLC-1");
    const [a] = await db("devices").insert({ serial: "TST-0002", kind: "imu6", firmware: "1.0" }).returning("id");
    const [b] = await db("devices").insert({ serial: "TST-0003", kind: "imu6", firmware: "1.0" }).returning("id");
    await db("device_assignments").insert({ device_id: a.id, patient_id: p, placement: "right_wrist", valid_from: "2026-03-01T00:00:00Z" });
    await expect(
      db("device_assignments").insert({ device_id: b.id, patient_id: p, placement: "right_wrist", valid_from: "2026-03-10T00:00:00Z" }),
    ).rejects.toThrow(/device_assignments_no_placement_overlap/);
  });

  it("enforces enum and range checks", async () => {
    await expect(
      db("patients").insert({ display_name: "X", research_id: "R-BAD-1", birth_year: 1800, sex: "female", condition: "stroke", enrolled_on: "2026-01-01" }),
    ).rejects.toThrow(/patients_birth_year_range/);
    await expect(
      db("users").insert({ email: "a@b.test", display_name: "A", role: "superuser", status: "invited" }),
    ).rejects.toThrow(/users_role_enum/);
  });

  it("treats e-mail addresses case-insensitively", async () => {
    await db("users").insert({ email: "Case@Example.test", display_name: "A", role: "researcher" });
    await expect(db("users").insert({ email: "case@example.test", display_name: "B", role: "researcher" })).rejects.toThrow(/users_email_lower_unique/);
  });

  it("migrates down and up again cleanly", async () => {
    const other = await createTestDatabase("db_roundtrip");
    const odb = createDb(other.url);
    try {
      await odb.migrate.rollback(undefined, true);
      const { rows } = await odb.raw("SELECT count(*)::int AS n FROM information_schema.tables WHERE table_schema = 'public' AND table_name = 'patients'");
      expect(rows[0].n).toBe(0);
      await odb.migrate.latest();
      const again = await odb.raw("SELECT count(*)::int AS n FROM information_schema.tables WHERE table_schema = 'public' AND table_name = 'patients'");
      expect(again.rows[0].n).toBe(1);
    } finally {
      await odb.destroy();
      await other.drop();
    }
  });
});
