import { describe, expect, it } from "vitest";
import { scanDecimalRow } from "../scan-decimal-row";
import { COMMA, scanDecimalRowBytes, TAB } from "../scan-decimal-row-bytes";

const encode = (text: string) => new TextEncoder().encode(text);

function scanBoth(text: string, target: Int32Array) {
  const fromText = new Float64Array(target.length).fill(Number.NaN);
  const fromBytes = new Float64Array(target.length).fill(Number.NaN);
  return {
    text: { end: scanDecimalRow(text, 0, target.length, target, fromText), row: Array.from(fromText) },
    bytes: { end: scanDecimalRowBytes(encode(text), 0, COMMA, target.length, target, fromBytes), row: Array.from(fromBytes) },
  };
}

/** Small seeded LCG (Numerical Recipes constants) so the sample of rows is the same every run. */
function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 2 ** 32;
  };
}

describe("scanDecimalRowBytes(bytes, pos, separator, nCols, target, row)", () => {
  it("gives the text scanner's doubles and row end on rows ended by \\n, odd cells included", () => {
    const rnd = lcg(20261202);
    const pieces = ["", "-", "+", ".", "e", "E-", "e+", "1", "0", "9", "7", "5", "3", " ", "x", "\r", "ü", "00000000"];
    const target = Int32Array.of(0, -1, 1, 2);
    const mismatches: string[] = [];
    for (let trial = 0; trial < 20_000; trial++) {
      const cells = Array.from({ length: 3 + Math.floor(rnd() * 3) }, () =>
        Array.from({ length: Math.floor(rnd() * 6) }, () => pieces[Math.floor(rnd() * pieces.length)]).join(""),
      );
      const text = cells.join(",") + (rnd() < 0.5 ? "\n" : "\r\n") + "9,9,9,9\n";
      const { text: a, bytes: b } = scanBoth(text, target);
      const ascii = [...text].every((ch) => ch.charCodeAt(0) < 0x80);
      // Byte offsets equal character offsets on ASCII rows; elsewhere both must refuse the row or skip the same cell.
      const sameEnd = ascii ? b.end === a.end : (a.end < 0) === (b.end < 0);
      if (!sameEnd || (a.end >= 0 && a.row.some((v, i) => !Object.is(v, b.row[i])))) mismatches.push(JSON.stringify(text));
    }
    expect(mismatches).toEqual([]);
  });

  it("takes at most one sign before the digits, as the text scanner does", () => {
    // Random cells seldom make a whole row valid, so a sign pair in an otherwise valid row is checked here.
    const all = Int32Array.of(0, 1, 2);
    for (const cell of ["-5", "+5", "-+5", "+-5", "--5", "++5", "-", "+", "-.5", "+.5e1"]) {
      const { text: a, bytes: b } = scanBoth(`${cell},-1.25,+2\n`, all);
      expect(b, cell).toEqual(a);
    }
    expect(scanBoth("-5,-1.25,+2\n", all).bytes).toEqual({ end: 11, row: [-5, -1.25, 2] });
  });

  it("returns the index of the \\n of a \\n or \\r\\n row, and −1 for a row without one", () => {
    const all = Int32Array.of(0, 1, 2);
    expect(scanBoth("1,2,3\n4,5,6", all).bytes).toEqual({ end: 5, row: [1, 2, 3] });
    expect(scanBoth("1,2,3\r\n", all).bytes.end).toBe(6);
    expect(scanBoth("1,2,3", all).bytes.end).toBe(-1);
    expect(scanBoth("1,2,3\r", all).bytes.end).toBe(-1);
    expect(scanBoth("1,2,x", Int32Array.of(0, 1, -1)).bytes.end).toBe(-1);
    expect(scanBoth("1,2,3,4\n", all).bytes.end).toBe(-1);
    expect(scanBoth("1,2,3,4\n", Int32Array.of(0, 1, -1)).bytes.end).toBe(-1);
  });

  it("splits at the separator it is given: tabs for BIDS Motion rows, where a comma is a bad cell", () => {
    const row = new Float64Array(3);
    expect(scanDecimalRowBytes(encode("1\t-2.5\t3e2\n"), 0, TAB, 3, Int32Array.of(0, 1, 2), row)).toBe(10);
    expect(Array.from(row)).toEqual([1, -2.5, 300]);
    expect(scanDecimalRowBytes(encode("1,2,3\n"), 0, TAB, 3, Int32Array.of(0, 1, 2), row)).toBe(-1);
    expect(scanDecimalRowBytes(encode("1\t2\t3\n"), 0, COMMA, 3, Int32Array.of(0, 1, 2), row)).toBe(-1);
    // An ignored cell runs to the given separator, so a comma inside it is just part of the cell.
    expect(scanDecimalRowBytes(encode("1\tx,y\t3\n"), 0, TAB, 3, Int32Array.of(0, -1, 1), row)).toBe(7);
    expect(Array.from(row.subarray(0, 2))).toEqual([1, 3]);
  });
});
