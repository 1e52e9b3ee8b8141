import { execFileSync } from "node:child_process";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { createDb, createTestDatabase, type TestDatabase } from "@pendula/db";

const root = new URL("../..", import.meta.url).pathname;
let source: TestDatabase;
let target: TestDatabase;
let sdb: Knex;
let tdb: Knex;
let dir: string;

beforeAll(async () => {
  source = await createTestDatabase("bk_src");
  target = await createTestDatabase("bk_dst");
  sdb = createDb(source.url);
  tdb = createDb(target.url);
  dir = mkdtempSync(join(tmpdir(), "pendula-backup-"));
});
afterAll(async () => {
  await sdb?.destroy();
  await tdb?.destroy();
  await source?.drop();
  await target?.drop();
  if (dir) rmSync(dir, { recursive: true, force: true });
});

describe("npm run db:backup / db:restore", () => {
  it("round-trips patients, devices and the assignment constraints through pg_dump and pg_restore", async () => {
    const [p] = await sdb("patients")
      .insert({ display_name: "Backup Person", research_id: "R-BK-1", birth_year: 1970, sex: "male", condition: "parkinsons", enrolled_on: "2026-02-02" })
      .returning("id");
    const [d] = await sdb("devices").insert({ serial: "BK-0001", kind: "imu6", firmware: "1.2" }).returning("id");
    await sdb("device_assignments").insert({ device_id: d.id, patient_id: p.id, placement: "left_wrist", valid_from: "2026-02-02T00:00:00Z" });
    // Something in the target that the restore must replace.
    await tdb("devices").insert({ serial: "STALE-1", kind: "imu6", firmware: "0.1" });

    const file = join(dir, "roundtrip.dump");
    execFileSync("bash", [join(root, "scripts/db-backup.sh"), file], { env: { ...process.env, DATABASE_URL: source.url }, stdio: "pipe" });
    execFileSync("bash", [join(root, "scripts/db-restore.sh"), file], { env: { ...process.env, DATABASE_URL: target.url }, stdio: "pipe" });

    expect(await tdb("patients").pluck("research_id")).toEqual(["R-BK-1"]);
    expect(await tdb("devices").pluck("serial")).toEqual(["BK-0001"]);
    const row = await tdb("device_assignments").count({ n: "*" }).first();
    expect(Number(row?.n)).toBe(1);
    // The exclusion constraint came back too: an overlapping assignment is still refused.
    await expect(
      tdb("device_assignments").insert({ device_id: d.id, patient_id: p.id, placement: "right_wrist", valid_from: "2026-03-01T00:00:00Z" }),
    ).rejects.toThrow(/no_device_overlap/);
  });

  it("refuses a missing backup file with a clear message and exit code 2", () => {
    let status = 0;
    let stderr = "";
    try {
      execFileSync("bash", [join(root, "scripts/db-restore.sh"), join(dir, "nope.dump")], { env: { ...process.env, DATABASE_URL: target.url }, stdio: "pipe" });
    } catch (e) {
      const err = e as { status: number; stderr: Buffer };
      status = err.status;
      stderr = err.stderr.toString();
    }
    expect(status).toBe(2);
    expect(stderr).toMatch(/no such backup file/);
  });
});
