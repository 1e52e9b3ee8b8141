import { describe, expect, it } from "vitest";
import { CONDITIONS, PLACEMENTS, ROLES } from "@pendula/ingest-server/contracts";
import { CONDITION_LABEL, CONDITION_OPTIONS, CONDITION_SHORT_LABEL, conditionLabel } from "../condition-labels";
import { PLACEMENT_LABEL, PLACEMENT_OPTIONS, PLACEMENT_PLAIN_WORDS, placementLabel, placementWords } from "../placement-labels";
import { ROLE_LABEL, roleLabel } from "../role-labels";

// The value lists are the server's enumerations (db/src/enums.ts, enforced by CHECK constraints);
// the Records make a missing label a type error, these checks make a stray or empty one a failure.
const keysOf = (o: object) => Object.keys(o).sort();

describe("placement labels", () => {
  it("has words for exactly the server's placements, none empty", () => {
    expect(keysOf(PLACEMENT_LABEL)).toEqual([...PLACEMENTS].sort());
    expect(keysOf(PLACEMENT_PLAIN_WORDS)).toEqual([...PLACEMENTS].sort());
    for (const p of PLACEMENTS) {
      expect(PLACEMENT_LABEL[p].trim()).not.toBe("");
      expect(PLACEMENT_PLAIN_WORDS[p].trim()).not.toBe("");
    }
  });

  it("lists the options in the server's order: the weekly test's four placements first", () => {
    expect(PLACEMENT_OPTIONS.map((o) => o.value)).toEqual([...PLACEMENTS]);
    expect(PLACEMENT_OPTIONS.slice(0, 4).map((o) => o.label)).toEqual(["Left shank", "Right shank", "Left wrist", "Right wrist"]);
  });

  it("uses anatomical terms for the care team and everyday words for patients", () => {
    // "Shank": the lower leg between knee and ankle (common practice in gait analysis writing).
    expect(placementLabel("left_shank")).toBe("Left shank");
    expect(placementWords("left_shank")).toBe("left lower leg");
    expect(placementWords("right_wrist")).toBe("right wrist");
  });

  it("shows a value this build does not know rather than hiding it", () => {
    expect(placementLabel("left_ear")).toBe("left_ear");
    expect(placementLabel("toString")).toBe("toString"); // not read from Object.prototype
    expect(placementWords("left_upper_arm")).toBe("left upper arm");
    expect(placementWords(null)).toBe("unknown position");
    expect(placementWords("")).toBe("unknown position");
  });
});

describe("condition labels", () => {
  it("has full and compact words for exactly the server's conditions", () => {
    expect(keysOf(CONDITION_LABEL)).toEqual([...CONDITIONS].sort());
    expect(keysOf(CONDITION_SHORT_LABEL)).toEqual([...CONDITIONS].sort());
    expect(CONDITION_OPTIONS.map((o) => o.value)).toEqual([...CONDITIONS]);
  });

  it("writes the full name, or the field's usual abbreviation in tables", () => {
    expect(conditionLabel("incomplete_sci")).toBe("Incomplete spinal cord injury");
    expect(conditionLabel("incomplete_sci", { short: true })).toBe("Incomplete SCI");
    expect(conditionLabel("parkinsons")).toBe("Parkinson's disease");
    expect(conditionLabel("parkinsons", { short: true })).toBe("Parkinson's");
    expect(conditionLabel("other")).toBe("Other condition");
  });

  it("reads a missing condition as a dash and shows an unknown one as it came", () => {
    expect(conditionLabel(null)).toBe("—");
    expect(conditionLabel("")).toBe("—");
    expect(conditionLabel("multiple_sclerosis")).toBe("multiple_sclerosis");
    expect(conditionLabel("constructor", { short: true })).toBe("constructor");
  });
});

describe("role labels", () => {
  it("has words for exactly the server's roles", () => {
    expect(keysOf(ROLE_LABEL)).toEqual([...ROLES].sort());
    expect(roleLabel("admin")).toBe("Administrator");
    expect(roleLabel("auditor")).toBe("auditor");
    expect(roleLabel("hasOwnProperty")).toBe("hasOwnProperty");
  });
});
