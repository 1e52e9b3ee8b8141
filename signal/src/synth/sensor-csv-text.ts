import type { Placement } from "../types";

export interface SensorCsvHeader {
  deviceSerial: string;
  placement: Placement | null;
  sampleRateHz: number;
  startUtc: string;
  gyroUnits: "deg/s" | "rad/s";
}

const POW10 = [1, 10, 100, 1000, 10000, 100000, 1000000];

/**
 * Sensor CSV v1 text (issue 3): "# key: value" header lines, the column line, then one row per
 * sample. Columns hold the file clock t_s (5 decimals), acceleration in m/s² (3 decimals) and
 * gyro in deg/s (2 decimals) or rad/s (5 decimals). Digits are written straight into an ASCII
 * byte buffer (no per-number strings): a 30-minute 200 Hz file is 360 000 rows.
 */
export function sensorCsvText(
  header: SensorCsvHeader,
  timeS: Float64Array,
  acc: [Float64Array, Float64Array, Float64Array],
  gyro: [Float64Array, Float64Array, Float64Array],
): string {
  const head = [
    "# pendula-sensor: 1",
    `# device: ${header.deviceSerial}`,
    ...(header.placement ? [`# placement: ${header.placement}`] : []),
    `# sample_rate_hz: ${header.sampleRateHz}`,
    `# start_utc: ${header.startUtc}`,
    `# units: acc=m/s2, gyro=${header.gyroUnits}`,
    "t_s,acc_x,acc_y,acc_z,gyro_x,gyro_y,gyro_z",
    "",
  ].join("\n");
  const gyroDigits = header.gyroUnits === "rad/s" ? 5 : 2;
  const n = timeS.length;
  const columns: [Float64Array, number][] = [
    [timeS, 5],
    [acc[0], 3],
    [acc[1], 3],
    [acc[2], 3],
    [gyro[0], gyroDigits],
    [gyro[1], gyroDigits],
    [gyro[2], gyroDigits],
  ];
  // Widest cell: sign + 16 integer digits + point + 6 decimals; 7 cells plus separators.
  const buf = new Uint8Array(n * 7 * 25 + 16);
  const scratch = new Uint8Array(24);
  let pos = 0;
  for (let i = 0; i < n; i++) {
    pos = writeFixed(buf, pos, timeS[i]!, 5, scratch);
    for (let c = 1; c < 7; c++) {
      buf[pos++] = 44; // ","
      const col = columns[c]![0];
      pos = writeFixed(buf, pos, col[i]!, columns[c]![1], scratch);
    }
    buf[pos++] = 10; // "\n"
  }
  return head + asciiToString(buf.subarray(0, pos));
}

/** Writes v with d decimals (round half away from zero) as ASCII at pos; returns the new pos. */
function writeFixed(buf: Uint8Array, pos: number, v: number, d: number, scratch: Uint8Array): number {
  let scaled = Math.round(Math.abs(v) * POW10[d]!);
  if (v < 0 && scaled !== 0) buf[pos++] = 45; // "-"
  let len = 0;
  if (scaled < 2147483648) {
    // Small integers: int32 arithmetic, the common case for sensor values.
    let s = scaled | 0;
    for (let k = 0; k < d; k++) {
      const q = (s / 10) | 0;
      scratch[len++] = 48 + s - q * 10;
      s = q;
    }
    scratch[len++] = 46; // "."
    do {
      const q = (s / 10) | 0;
      scratch[len++] = 48 + s - q * 10;
      s = q;
    } while (s > 0);
  } else {
    for (let k = 0; k < d; k++) {
      scratch[len++] = 48 + (scaled % 10);
      scaled = Math.floor(scaled / 10);
    }
    scratch[len++] = 46;
    do {
      scratch[len++] = 48 + (scaled % 10);
      scaled = Math.floor(scaled / 10);
    } while (scaled > 0 && len < 24);
  }
  while (len > 0) buf[pos++] = scratch[--len]!;
  return pos;
}

/** ASCII bytes → string. Node's Buffer yields a compact one-byte string quickly; browsers decode. */
function asciiToString(bytes: Uint8Array): string {
  const nodeBuffer = (globalThis as { Buffer?: { from(b: ArrayBufferLike, o: number, l: number): { toString(e: string): string } } }).Buffer;
  if (nodeBuffer) return nodeBuffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength).toString("latin1");
  return new TextDecoder("latin1").decode(bytes);
}
