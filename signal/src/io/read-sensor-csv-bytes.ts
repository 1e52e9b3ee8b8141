import type { SensorRecording } from "../types";
import { MAX_SENSOR_FILE_CHARS, type ReadSensorCsvOptions, readSensorCsv } from "./read-sensor-csv";
import { type MoreBytes, readSensorCsvWindow } from "./read-sensor-csv-window";
import { UTF8, byteOrderMarkLength, firstVisibleByte } from "./utf8";
import { sensorCsvFail } from "./sensor-csv-header";

/**
 * Reads a sensor CSV v1 file from its bytes, with the result and the errors of
 * `readSensorCsv(<the bytes decoded as UTF-8>, fileName, options)`, bit for bit and word for word,
 * but without building the text: data rows are scanned from the bytes straight into the typed
 * arrays (`readSensorCsvWindow`, on a window that holds the whole file). Only the header lines, and
 * a data row the fast scanner hands back, are decoded.
 *
 * The two questions the bytes alone cannot answer cheaply go to the text reader on the decoded
 * file: a file over the size limit (the limit and its message count characters) and one whose
 * first visible character is not ASCII ("empty" means only Unicode white space).
 */
export function readSensorCsvBytes(bytes: Uint8Array, fileName: string, options: ReadSensorCsvOptions = {}): SensorRecording {
  const maxChars = options.maxChars ?? MAX_SENSOR_FILE_CHARS;
  const n = bytes.length;
  const pos = byteOrderMarkLength(bytes, n);
  const firstVisible = firstVisibleByte(bytes, pos, n);
  if (n > maxChars || (firstVisible < n && bytes[firstVisible]! >= 0x80)) {
    return readSensorCsv(UTF8.decode(bytes), fileName, options);
  }
  if (firstVisible === n) sensorCsvFail(fileName)(1, undefined, "file is empty");
  return readSensorCsvWindow({ bytes, pos, filled: n, end: n, eof: true }, noMoreBytes, n, fileName);
}

/** The whole file is in the window from the start: nothing more to read. */
const noMoreBytes: MoreBytes = () => {
  throw new Error("readSensorCsvBytes: the window already holds the whole file");
};
