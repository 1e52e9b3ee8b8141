import { describe, expect, it } from "vitest";
import { SignalInputError, bidsMotionText, readSensorCsv, synthesizeSession } from "@pendula/signal";
import type { RawFileRow } from "../../sessions/sessions.repository";
import { loadRecordings } from "../process-session";

const session = synthesizeSession({ seed: 41, durationS: 30, placements: ["left_shank", "right_shank", "left_wrist"] });
const recs = session.files.map((f) => readSensorCsv(f.text, f.fileName));
const bids = bidsMotionText(recs.slice(0, 2), { stem: "sub-demo09_task-homewalk_tracksys-imu" });

function stored(files: Record<string, string>) {
  const objects = new Map(Object.entries(files).map(([name, text]) => [`k/${name}`, Buffer.from(text)]));
  return { get: async (key: string) => objects.get(key)! };
}

function row(name: string, over: Partial<RawFileRow> = {}): RawFileRow {
  return {
    id: name,
    session_id: "s",
    storage_key: `k/${name}`,
    sha256: "",
    size_bytes: 0,
    original_name: name,
    format: "pendula-csv-v1",
    device_serial: "",
    device_id: null,
    placement: "left_wrist",
    start_utc: new Date("2026-11-20T08:00:00Z"),
    recording_placements: null,
    ...over,
  };
}

describe("loadRecordings(stored files)", () => {
  it("reads CSV and BIDS files with the upload's reader and applies the stored placements and clock", async () => {
    const wrist = session.files[2]!;
    const start = new Date("2026-11-21T07:30:00Z");
    const bidsRow = { format: "bids-motion" as const, placement: "left_shank", start_utc: start, recording_placements: { "DEMO-TS-07:LeftShank": "right_shank", "DEMO-TS-07:RightShank": "left_shank" } };
    const rows = [
      row(bids.channelsFileName, bidsRow),
      row(wrist.fileName, { placement: "right_wrist" }),
      row(bids.motionFileName, bidsRow),
      row(bids.jsonFileName, bidsRow),
    ];
    const storage = stored({ [bids.motionFileName]: bids.motionTsv, [bids.channelsFileName]: bids.channelsTsv, [bids.jsonFileName]: bids.motionJson, [wrist.fileName]: wrist.text });
    const out = await loadRecordings({ storage } as never, rows);
    // The placement stored at upload wins over the file's own (header or tracked point).
    expect(out.map((r) => [r.deviceSerial, r.placement])).toEqual([
      [recs[2]!.deviceSerial, "right_wrist"],
      ["DEMO-TS-07:LeftShank", "right_shank"],
      ["DEMO-TS-07:RightShank", "left_shank"],
    ]);
    expect(out[1]!.startUtc).toBe(start.toISOString());
    expect(Array.from(out[0]!.gyroX)).toEqual(Array.from(recs[2]!.gyroX));
  });

  it("a stored file that no longer reads is bad input (fails at once), with the reader's file and line", async () => {
    const f = session.files[0]!;
    const broken = f.text.replace(/\n(\d[^,\n]*),[^,\n]*/, "\n$1,abc");
    const err = await loadRecordings({ storage: stored({ [f.fileName]: broken }) } as never, [row(f.fileName)]).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(SignalInputError);
    expect((err as SignalInputError).fileName).toBe(f.fileName);
    expect((err as SignalInputError).message).toMatch(/line \d+, column acc_x: "abc" is not a number/);
  });
});
