// Minimal reader for the generator's own output in tests (no validation; the product reader is
// signal/src/io/read-sensor-csv.ts and has its own tests).
export interface Columns {
  header: Map<string, string>;
  t: Float64Array;
  acc: [Float64Array, Float64Array, Float64Array];
  gyro: [Float64Array, Float64Array, Float64Array];
}

export function readColumns(text: string): Columns {
  const lines = text.split("\n");
  const header = new Map<string, string>();
  let i = 0;
  for (; i < lines.length && lines[i]!.startsWith("#"); i++) {
    const body = lines[i]!.slice(1);
    const colon = body.indexOf(":");
    header.set(body.slice(0, colon).trim(), body.slice(colon + 1).trim());
  }
  i++; // column line
  const rows = lines.slice(i).filter((l) => l.length > 0);
  const n = rows.length;
  const cols = Array.from({ length: 7 }, () => new Float64Array(n));
  rows.forEach((row, r) => {
    const cells = row.split(",");
    for (let c = 0; c < 7; c++) cols[c]![r] = Number(cells[c]);
  });
  return { header, t: cols[0]!, acc: [cols[1]!, cols[2]!, cols[3]!], gyro: [cols[4]!, cols[5]!, cols[6]!] };
}
