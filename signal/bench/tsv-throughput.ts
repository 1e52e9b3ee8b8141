// BIDS Motion TSV parse throughput for `npm run bench`: the session's CSV recordings written as one
// BIDS tracking system (bidsMotionText: LATENCY + six channels per sensor, 4 decimals), then read
// back by the text reader (on the decoded string) and by the byte reader (on the bytes). CPU seconds
// of this process; first run on cold code, then the best of three warm runs.
import { readBidsMotion } from "../src/io/read-bids-motion";
import { readBidsMotionBytes } from "../src/io/read-bids-motion-bytes";
import { bidsMotionText } from "../src/synth/bids-motion-text";
import type { SensorRecording } from "../src/types";

export interface TsvThroughput {
  tsvBytes: number;
  tsvTextParseCpuS: number;
  tsvBytesParseCpuS: number;
  tsvBytesParseWarmCpuS: number;
}

function cpuS(): number {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1e6;
}

export function measureTsvThroughput(recordings: readonly SensorRecording[]): TsvThroughput {
  const set = bidsMotionText(recordings);
  const bytes = new TextEncoder().encode(set.motionTsv);
  const common = { ...set, startUtc: "2026-11-23T09:15:02.120Z", maxChars: 1 << 30 };
  const timed = (read: () => SensorRecording[]): number => {
    const c = cpuS();
    const out = read();
    if (out.length !== recordings.length) throw new Error(`read ${out.length} tracked points, wrote ${recordings.length}`);
    return cpuS() - c;
  };
  // Bytes first: its cold figure is what an upload's first parse in a fresh process costs.
  const tsvBytesParseCpuS = timed(() => readBidsMotionBytes({ ...common, motionTsv: bytes }));
  const tsvBytesParseWarmCpuS = Math.min(
    timed(() => readBidsMotionBytes({ ...common, motionTsv: bytes })),
    timed(() => readBidsMotionBytes({ ...common, motionTsv: bytes })),
    timed(() => readBidsMotionBytes({ ...common, motionTsv: bytes })),
  );
  const tsvTextParseCpuS = timed(() => readBidsMotion({ ...common, motionTsv: set.motionTsv }));
  return { tsvBytes: bytes.length, tsvTextParseCpuS, tsvBytesParseCpuS, tsvBytesParseWarmCpuS };
}

export function describeTsvThroughput(t: TsvThroughput): string {
  // MB as the CSV line beside it counts them (2^20 bytes).
  const rate = (s: number) => (t.tsvBytes / 1048576 / s).toFixed(0);
  return (
    `${(t.tsvBytes / 1048576).toFixed(1)} MB of BIDS Motion TSV: text reader ${rate(t.tsvTextParseCpuS)} MB/s (on the decoded string); ` +
    `byte reader ${rate(t.tsvBytesParseCpuS)} MB/s first run, ${rate(t.tsvBytesParseWarmCpuS)} MB/s warm (best of 3).`
  );
}
