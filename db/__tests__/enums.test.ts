import { describe, expect, it } from "vitest";
import { PLACEMENTS as SIGNAL_PLACEMENTS } from "../../signal/src/types";
import { PLACEMENTS } from "../src/enums";

// The database's CHECK constraint and the analysis must agree on where a sensor can be worn; a
// new placement needs both a migration and a signal change, and this fails until both are made.
describe("placements", () => {
  it("are the same list in the schema enums and in the analysis types", () => {
    expect([...PLACEMENTS]).toEqual([...SIGNAL_PLACEMENTS]);
  });
});
