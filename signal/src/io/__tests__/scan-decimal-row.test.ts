import { describe, expect, it } from "vitest";
import { readSensorCsv } from "../read-sensor-csv";
import { scanDecimalRow } from "../scan-decimal-row";

const ALL = Int32Array.of(0, 1, 2);

function scan(text: string, target: Int32Array = ALL): { end: number; row: number[] } {
  const row = new Float64Array(target.length).fill(Number.NaN);
  const end = scanDecimalRow(text, 0, target.length, target, row);
  return { end, row: Array.from(row) };
}

/** Small seeded LCG (Numerical Recipes constants) so the sample of decimals is the same every run. */
function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 2 ** 32;
  };
}

describe("scanDecimalRow(text, pos, nCols, target, row)", () => {
  // Reference: ECMAScript Number(string) (ECMA-262 StringToNumber), which rounds correctly to the
  // nearest double. With ≤ 15 significant digits and |power of ten| ≤ 22 both operands of the
  // scanner's one multiplication or division are exact doubles, so its result is correctly rounded too.
  it("gives the same doubles as Number() for plain decimals of up to 15 digits", () => {
    const rnd = lcg(20261123);
    const mismatches: string[] = [];
    for (let trial = 0; trial < 20_000; trial++) {
      const cells: string[] = [];
      for (let c = 0; c < 3; c++) {
        const intDigits = Math.floor(rnd() * 8);
        const fracDigits = Math.floor(rnd() * (15 - intDigits));
        let s = rnd() < 0.4 ? "-" : rnd() < 0.05 ? "+" : "";
        for (let i = 0; i < intDigits; i++) s += String(Math.floor(rnd() * 10));
        if (fracDigits > 0 || intDigits === 0) s += "." + Array.from({ length: Math.max(1, fracDigits) }, () => String(Math.floor(rnd() * 10))).join("");
        if (rnd() < 0.1) s += `e${rnd() < 0.5 ? "-" : ""}${Math.floor(rnd() * 6)}`;
        cells.push(s);
      }
      const text = cells.join(",") + "\n";
      const { end, row } = scan(text);
      if (end !== text.length - 1 || row.some((v, i) => !Object.is(v, Number(cells[i])))) mismatches.push(text);
    }
    expect(mismatches).toEqual([]);
  });

  it("ends a row at \\n, \\r\\n or the end of the text and returns the index of its \\n", () => {
    expect(scan("1,2,3\n4,5,6").end).toBe(5);
    expect(scan("1,2,3\r\n4,5,6").end).toBe(6);
    expect(scan("1,2,3").end).toBe(5);
    expect(scan("1,2,3\r").end).toBe(6);
    expect(scan("1,2,3").row).toEqual([1, 2, 3]);
  });

  it("skips ignored cells whatever they hold and parses the others", () => {
    const { end, row } = scan("7,n/a,-2.5e1\n", Int32Array.of(0, -1, 1));
    expect(end).toBe(12);
    expect(row.slice(0, 2)).toEqual([7, -25]);
    expect(scan("7,8,\r\n", Int32Array.of(0, 1, -1)).end).toBe(5);
  });

  it("returns −1 for every row the general path must judge", () => {
    for (const text of [
      "",
      "\n",
      " 1,2,3\n",
      "1 ,2,3\n",
      "1,,3\n",
      "1,2\n",
      "1,2,3,4\n",
      "1,2,3x\n",
      "1,2,.\n",
      "1,2,-\n",
      "1,2,1e\n",
      "1,2,NaN\n",
      "1,2,Infinity\n",
      "1,2,0x1\n",
      "1,2,1234567890123456\n",
      "1,2,1e23\n",
      "1,2,3\rx\n",
    ]) {
      expect(scan(text).end, JSON.stringify(text)).toBe(-1);
    }
    expect(scan("1,2,3,4\n", Int32Array.of(0, 1, -1)).end).toBe(-1);
  });
});

describe("readSensorCsv with rows off the fast path", () => {
  it("reads spaced cells and 17-digit values exactly as Number() does", () => {
    const text = [
      "# pendula-sensor: 1",
      "# device: PX-0042",
      "# sample_rate_hz: 100",
      "# start_utc: 2026-11-23T09:15:02.120Z",
      "# units: acc=m/s2, gyro=deg/s",
      "t_s,acc_x,acc_y,acc_z,gyro_x,gyro_y,gyro_z",
      "0, 1.5 ,2,3,4,5,6",
      "0.01000000000000001,1,2,3,4,5,6",
      "0.02,1,2,3,4,5,6",
    ].join("\n");
    const r = readSensorCsv(text, "walk.csv");
    expect(Array.from(r.timeS)).toEqual([0, Number("0.01000000000000001"), 0.02]);
    expect(Array.from(r.accX)).toEqual([1.5, 1, 1]);
  });
});
