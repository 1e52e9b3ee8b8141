import { readdirSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { MIGRATIONS } from "../src/migration-source";

describe("migration source", () => {
  it("lists every file in db/migrations, each with up and down", () => {
    const onDisk = readdirSync(new URL("../migrations", import.meta.url))
      .filter((f) => f.endsWith(".ts"))
      .map((f) => f.replace(/\.ts$/, ""))
      .sort();
    expect(Object.keys(MIGRATIONS).sort()).toEqual(onDisk);
    for (const m of Object.values(MIGRATIONS)) {
      expect(typeof m.up).toBe("function");
      expect(typeof m.down).toBe("function");
    }
  });

  it("names migrations with a sortable timestamp prefix", () => {
    for (const name of Object.keys(MIGRATIONS)) expect(name).toMatch(/^\d{14}_[a-z0-9_]+$/);
  });
});
