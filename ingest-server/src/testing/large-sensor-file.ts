import { synthesizeSession } from "../../../signal/src/synth";

/**
 * Sensor CSV v1 files of a chosen size for upload limits, benches and liveness tests: the data rows
 * of a synthetic 10-minute walk (signal's generator), repeated with the time shifted by the walk's
 * length until `bytes` is reached. Rows are built once per size and shared between serials, so a
 * test holding many "different" large files holds one copy of the rows.
 */
const rowCache = new Map<number, Buffer>();

export function sampleRows(bytes: number): Buffer {
  const cached = rowCache.get(bytes);
  if (cached) return cached;
  const synth = synthesizeSession({ durationS: 600, placements: ["left_shank"], deviceSerials: { left_shank: "X" } });
  const lines = synth.files[0]!.text.split("\n").filter((l) => /^[0-9]/.test(l));
  const rateHz = 100;
  const periodS = lines.length / rateHz;
  const chunks: string[] = [];
  let size = 0;
  outer: for (let k = 0; ; k++) {
    for (const line of lines) {
      const comma = line.indexOf(",");
      const row = `${(Number(line.slice(0, comma)) + k * periodS).toFixed(5)}${line.slice(comma)}\n`;
      if (size + row.length > bytes) break outer;
      chunks.push(row);
      size += row.length;
    }
  }
  const rows = Buffer.from(chunks.join(""), "latin1");
  rowCache.set(bytes, rows);
  return rows;
}

export function sensorCsvHeader(serial: string, placement: string, startUtc = "2026-11-23T09:15:02.120Z"): string {
  return [
    "# pendula-sensor: 1",
    `# device: ${serial}`,
    `# placement: ${placement}`,
    "# sample_rate_hz: 100",
    `# start_utc: ${startUtc}`,
    "# units: acc=m/s2, gyro=deg/s",
    "t_s,acc_x,acc_y,acc_z,gyro_x,gyro_y,gyro_z",
    "",
  ].join("\n");
}

/** One whole file of exactly `bytes` bytes or just under (header + shared rows, concatenated). */
export function largeSensorCsv(serial: string, placement: string, bytes: number): Buffer {
  const head = Buffer.from(sensorCsvHeader(serial, placement), "latin1");
  return Buffer.concat([head, sampleRows(bytes - head.length)]);
}
