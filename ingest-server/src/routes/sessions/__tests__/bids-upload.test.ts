import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { processSession } from "../../../processing/process-session";
import { createTestContext, type SeededUser, type TestContext } from "../../../testing/harness";
import { bidsSetFromSynth, seedDevices, storedCounts, synthFor, upload } from "../../../testing/session-fixtures";

// A BIDS Motion set (BIDS specification, motion data: headerless _motion.tsv + _channels.tsv +
// _motion.json; the clock time lives in _scans.tsv, so the upload sends startUtc) through the
// upload route, the worker and the session read.
let ctx: TestContext;
let patient: SeededUser;
let otherPatient: SeededUser;
let clinician: SeededUser;
const tokens: Record<string, string> = {};
const START = "2026-11-23T09:15:00.000Z";
const mean = (xs: number[]) => xs.reduce((a, b) => a + b, 0) / xs.length;

beforeAll(async () => {
  ctx = await createTestContext({ env: { UPLOAD_MAX_FILE_BYTES: String(8 * 1024 * 1024) } });
  clinician = await ctx.seedUser({ role: "clinician" });
  patient = await ctx.seedUser({ role: "patient", caseloadOf: [clinician.id] });
  otherPatient = await ctx.seedUser({ role: "patient", caseloadOf: [clinician.id] });
  for (const u of [clinician, patient, otherPatient]) tokens[u.id] = await ctx.tokenFor(u);
});

afterAll(async () => {
  await ctx?.close();
});

describe("POST /api/sessions with a BIDS Motion set", () => {
  const synth = () => synthFor({}, { seed: 23, strideTimeS: 1.15, startUtc: START });

  it("stores the set, maps each registered <DeviceSerialNumber>:<tracked point> through its assignment and processes to done", async () => {
    // The set names no DeviceSerialNumber, so the reader keys sensors by TrackingSystemName "imu".
    const placementOf: Record<string, string> = { LeftShank: "left_shank", RightShank: "right_shank", LeftWrist: "left_wrist", RightWrist: "right_wrist" };
    const deviceIds: string[] = [];
    for (const [point, placement] of Object.entries(placementOf)) {
      const [device] = await ctx.db("devices").insert({ serial: `imu:${point}`, kind: "imu6", firmware: "2.4.1", status: "assigned" }).returning("id");
      await ctx.db("device_assignments").insert({ device_id: device.id, patient_id: patient.patientId, placement, valid_from: "2026-01-01T00:00:00Z" });
      deviceIds.push(device.id as string);
    }
    const files = bidsSetFromSynth(synth());
    const before = await storedCounts(ctx);
    const res = await upload(ctx, tokens[patient.id]!, files, { startUtc: START });
    expect(res.status, JSON.stringify(res.body)).toBe(202);
    const after = await storedCounts(ctx);
    expect(after.sessions - before.sessions).toBe(1);
    expect(after.files - before.files).toBe(3);
    expect(after.objects - before.objects).toBe(4); // and the parsed recordings (uploads/parsed-recordings.ts)
    const rows = await ctx.db("raw_files").where({ session_id: res.body.id }).orderBy("original_name");
    expect(rows.map((r) => r.format)).toEqual(["bids-motion", "bids-motion", "bids-motion"]);
    const data = rows.find((r) => r.original_name.endsWith("_motion.tsv"))!;
    expect(Object.values(data.recording_placements).sort()).toEqual(["left_shank", "left_wrist", "right_shank", "right_wrist"]);
    // Every file of the set carries the device of its first recording; the data file maps all four.
    expect(rows.every((r) => deviceIds.includes(r.device_id))).toBe(true);

    expect(await processSession(ctx.deps, res.body.id)).toBe("done");
    const session = await request(ctx.app).get(`/api/sessions/${res.body.id}`).set("Authorization", `Bearer ${tokens[clinician.id]}`);
    expect(session.status).toBe(200);
    expect(new Date(session.body.recordedAt).toISOString()).toBe(START);
    expect(session.body.analysis.session.placements.sort()).toEqual(["left_shank", "left_wrist", "right_shank", "right_wrist"]);
    // Truth: the generator's own events; cadence = 120 / mean stride time (a stride holds two steps).
    const expected = 120 / mean(synth().truth.strideTimesS);
    expect(Math.abs(session.body.analysis.metrics.cadenceStepsPerMin - expected) / expected).toBeLessThan(0.03);
    expect(session.body.analysis.metrics.armLeg.leftArmRightLeg.frequencyRatio).toBe(1);
  });

  it("an unregistered BIDS sensor → 422 unknown_device naming <DeviceSerialNumber>:<tracked point>, nothing stored", async () => {
    const files = bidsSetFromSynth(synthFor({}, { seed: 27, startUtc: START }));
    files[2]!.text = JSON.stringify({ ...JSON.parse(files[2]!.text), DeviceSerialNumber: "FHG-UNLISTED-77" });
    const before = await storedCounts(ctx);
    const res = await upload(ctx, tokens[clinician.id]!, files, { startUtc: START, patientId: patient.patientId! });
    expect(res.status, JSON.stringify(res.body)).toBe(422);
    expect(res.body.error.code).toBe("unknown_device");
    expect(res.body.error.details.deviceSerial).toMatch(/^FHG-UNLISTED-77:(Left|Right)(Shank|Wrist)$/);
    expect(res.body.error.message).toContain(res.body.error.details.deviceSerial);
    expect(await storedCounts(ctx)).toEqual(before);
  });

  it("without startUtc (and no clock time in the files) → 422 asking for it, nothing stored", async () => {
    const files = bidsSetFromSynth(synthFor({}, { seed: 24, startUtc: START }));
    const before = await storedCounts(ctx);
    const res = await upload(ctx, tokens[patient.id]!, files);
    expect(res.status, JSON.stringify(res.body)).toBe(422);
    expect(res.body.error.message).toMatch(/startUtc/);
    expect(await storedCounts(ctx)).toEqual(before);
  });

  it("a tracked point Pendula has no placement for → 422 naming it, nothing stored", async () => {
    const files = bidsSetFromSynth(synthFor({}, { seed: 25, startUtc: START }));
    files[1]!.text = files[1]!.text.replaceAll("LeftWrist", "LeftEar");
    const before = await storedCounts(ctx);
    const res = await upload(ctx, tokens[patient.id]!, files, { startUtc: START });
    expect(res.status, JSON.stringify(res.body)).toBe(422);
    expect(res.body.error.message).toMatch(/LeftEar/);
    expect(await storedCounts(ctx)).toEqual(before);
  });

  it("a registered tracking-system sensor still goes through its assignment: another patient's device → 422", async () => {
    // `<DeviceSerialNumber>:<tracked point>` registered and assigned to another patient.
    const serials = await seedDevices(ctx, otherPatient.patientId!, "BIDSREG");
    const systemSerial = serials.left_shank!.replace(/-[^-]*$/, "");
    await ctx.db("devices").where({ serial: serials.left_shank }).update({ serial: `${systemSerial}:LeftShank` });
    const files = bidsSetFromSynth(synthFor({}, { seed: 26, startUtc: START }));
    files[2]!.text = JSON.stringify({ ...JSON.parse(files[2]!.text), DeviceSerialNumber: systemSerial });
    const before = await storedCounts(ctx);
    const res = await upload(ctx, tokens[patient.id]!, files, { startUtc: START });
    expect(res.status, JSON.stringify(res.body)).toBe(422);
    expect(res.body.error.code).toBe("device_not_assigned");
    expect(await storedCounts(ctx)).toEqual(before);
  });
});
