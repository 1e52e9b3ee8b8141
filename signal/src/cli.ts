// `npm run --silent analyze -- <file>... [--json] [--height-cm N]` from the repository root. Reads sensor CSV v1
// files and BIDS Motion `*_motion.tsv` files (sidecars found beside them), prints a table or one
// JSON object. Exit 0 on success, 2 with a one-line reason on stderr for bad input.
import { readFileSync, statSync } from "node:fs";
import { basename, dirname, join } from "node:path";
import { analyze } from "./analyze";
import { MAX_SENSOR_FILE_CHARS } from "./io/read-sensor-csv";
import { readSensorCsvBytes } from "./io/read-sensor-csv-bytes";
import { bidsSidecarNames, readBidsMotion } from "./io/read-bids-motion";
import { sniffFormat } from "./io/sniff";
import { formatAnalysisTable } from "./format-table";
import { parseCliArgs, UsageError } from "./cli-args";
import { type SensorRecording, SignalInputError } from "./types";

function readText(path: string): string {
  return readBytes(path).toString("utf8");
}

function readBytes(path: string): Buffer {
  let size: number;
  try {
    size = statSync(path).size;
  } catch {
    throw new UsageError(`${path}: file not found`);
  }
  if (size > MAX_SENSOR_FILE_CHARS) throw new SignalInputError(`${basename(path)}: file is larger than the 64 MiB limit`, basename(path));
  return readFileSync(path);
}

export function loadRecordings(paths: readonly string[]): SensorRecording[] {
  const out: SensorRecording[] = [];
  for (const path of paths) {
    const name = basename(path);
    if (/_motion\.tsv$/i.test(name)) {
      const side = bidsSidecarNames(name);
      const dir = dirname(path);
      out.push(
        ...readBidsMotion({
          motionTsv: readText(path),
          motionFileName: name,
          channelsTsv: readText(join(dir, side.channels)),
          channelsFileName: side.channels,
          motionJson: readText(join(dir, side.json)),
          jsonFileName: side.json,
        }),
      );
      continue;
    }
    const bytes = readBytes(path);
    // The sniffer reads the first 4096 characters; 4 × 4096 bytes hold them whatever the encoding.
    const format = sniffFormat(bytes.toString("utf8", 0, 4 * 4096));
    if (format !== "pendula-csv-v1") {
      throw new SignalInputError(
        format === "unknown" ? `${name}: not a Pendula sensor CSV or BIDS *_motion.tsv file` : `${name}: looks like ${format}; pass the *_motion.tsv file instead`,
        name,
      );
    }
    out.push(readSensorCsvBytes(bytes, name));
  }
  return out;
}

function main(argv: string[]): number {
  try {
    const args = parseCliArgs(argv);
    const analysis = analyze(loadRecordings(args.files), args.heightCm === undefined ? {} : { heightCm: args.heightCm });
    process.stdout.write(args.json ? JSON.stringify(analysis) + "\n" : formatAnalysisTable(analysis));
    return 0;
  } catch (e) {
    if (e instanceof SignalInputError || e instanceof UsageError) {
      process.stderr.write(e.message.replace(/\s*\n\s*/g, " ") + "\n");
      return 2;
    }
    throw e;
  }
}

process.exitCode = main(process.argv.slice(2));
