// `npm run --silent analyze -- <file>... [--json] [--height-cm N]` from the repository root. Reads sensor CSV v1
// files and BIDS Motion `*_motion.tsv` files (sidecars found beside them), prints a table or one
// JSON object. Exit 0 on success, 2 with a one-line reason on stderr for bad input.
import { closeSync, openSync, readFileSync, readSync, statSync } from "node:fs";
import { basename, dirname, join } from "node:path";
import { analyze } from "./analyze";
import { MAX_SENSOR_FILE_CHARS } from "./io/read-sensor-csv";
import { readSensorCsvChunks } from "./io/read-sensor-csv-chunks";
import { bidsSidecarNames, readBidsMotion } from "./io/read-bids-motion";
import { sniffFormat } from "./io/sniff";
import { formatAnalysisTable } from "./format-table";
import { parseCliArgs, UsageError } from "./cli-args";
import { type SensorRecording, SignalInputError } from "./types";

function readText(path: string): string {
  checkedSize(path);
  return readFileSync(path, "utf8");
}

/** The file's size, after the checks every input gets: it exists, is a file, is within the limit. */
function checkedSize(path: string): number {
  let stat;
  try {
    stat = statSync(path);
  } catch {
    throw new UsageError(`${path}: file not found`);
  }
  if (!stat.isFile()) throw new UsageError(`${path}: not a file`);
  if (stat.size > MAX_SENSOR_FILE_CHARS) throw new SignalInputError(`${basename(path)}: file is larger than the 64 MiB limit`, basename(path));
  return stat.size;
}

/**
 * A sensor CSV read through the chunked reader (one reused window; reading whole files into new
 * memory cost more CPU than parsing them), after a look at its first bytes for the format.
 */
function readSensorCsvFile(path: string, name: string): SensorRecording {
  const size = checkedSize(path);
  const fd = openSync(path, "r");
  try {
    const source = { size, readAt: (into: Uint8Array, offset: number, length: number, position: number) => readSync(fd, into, offset, length, position) };
    // The sniffer reads the first 4096 characters; 4 × 4096 bytes hold them whatever the encoding.
    const head = Buffer.alloc(4 * 4096);
    let got = 0;
    for (let n; got < head.length && (n = source.readAt(head, got, head.length - got, got)) > 0; ) got += n;
    const format = sniffFormat(head.toString("utf8", 0, got));
    if (format !== "pendula-csv-v1") {
      throw new SignalInputError(
        format === "unknown" ? `${name}: not a Pendula sensor CSV or BIDS *_motion.tsv file` : `${name}: looks like ${format}; pass the *_motion.tsv file instead`,
        name,
      );
    }
    return readSensorCsvChunks(source, name);
  } finally {
    closeSync(fd);
  }
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
    out.push(readSensorCsvFile(path, name));
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

// A reader that stops early (`… --json | head`) closes the pipe: that is the reader's choice, not a
// failure of the analysis, so end quietly instead of with an unhandled EPIPE stack trace.
process.stdout.on("error", (err: NodeJS.ErrnoException) => {
  if (err.code !== "EPIPE") throw err;
  process.exit(process.exitCode ?? 0);
});
process.exitCode = main(process.argv.slice(2));
