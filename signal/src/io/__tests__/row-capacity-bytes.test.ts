import { describe, expect, it } from "vitest";
import { rowCapacity, rowCapacityBytes } from "../row-capacity";

describe("rowCapacityBytes(bytes, from, minRowBytes)", () => {
  it("gives rowCapacity's bound for the same ASCII text", () => {
    const texts = ["", "\n", "1,2\n3,4\n", "1,2\n3,4", "\n\n\n\n\n\n\n\n\n\n", "# h\n" + "0,1,2\r\n".repeat(50), "x".repeat(100)];
    for (const text of texts) {
      for (const from of [0, 1, 4]) {
        for (const minRow of [1, 3, 13]) {
          expect(rowCapacityBytes(new TextEncoder().encode(text), from, minRow), JSON.stringify([text.slice(0, 20), from, minRow])).toBe(
            rowCapacity(text, from, minRow),
          );
        }
      }
    }
  });

  it("bounds a file of blank lines by its size, not its line count", () => {
    expect(rowCapacityBytes(new Uint8Array(100_000).fill(10), 0, 13)).toBe(Math.floor(100_000 / 13) + 1);
  });
});
