import { mkdtempSync, readdirSync, rmSync, statSync } from "node:fs";
import type { Server } from "node:http";
import type { AddressInfo } from "node:net";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestContext, type SeededUser, type TestContext } from "../../testing/harness";
import { largeSensorCsv } from "../../testing/large-sensor-file";
import { multipartBody, writeAllThenRead, type RawAnswer } from "../../testing/raw-upload-client";
import { FOUR_PLACEMENTS, seedDevices, storedCounts, synthFor, upload } from "../../testing/session-fixtures";

// Refusals of an upload must reach clients that write the whole body before reading (see
// middleware/answer-after-body.ts), and no refused or accepted upload may leave its body on disk.
const MAX_FILE = 2 * 1024 * 1024;
let ctx: TestContext;
let server: Server;
let port = 0;
let tmpRoot: string;
let clinician: SeededUser;

beforeAll(async () => {
  tmpRoot = mkdtempSync(path.join(tmpdir(), "pendula-upload-tmp-test-"));
  ctx = await createTestContext({
    env: { UPLOAD_MAX_FILE_BYTES: String(MAX_FILE), UPLOAD_RATE_LIMIT: "3", UPLOAD_TMP_DIR: path.join(tmpRoot, "uploads") },
  });
  server = ctx.app.listen(0, "127.0.0.1");
  await new Promise((r) => server.once("listening", r));
  port = (server.address() as AddressInfo).port;
  clinician = await ctx.seedUser({ role: "clinician" });
});

afterAll(async () => {
  await new Promise((r) => server?.close(r));
  await ctx?.close();
  rmSync(tmpRoot, { recursive: true, force: true });
});

async function patientWithDevices(prefix: string) {
  const user = await ctx.seedUser({ role: "patient", caseloadOf: [clinician.id] });
  const serials = await seedDevices(ctx, user.patientId!, prefix);
  return { user, serials, token: await ctx.tokenFor(user) };
}

/** Four valid files of MAX_FILE bytes each (8 MiB of body) for the patient's registered devices. */
function fourLargeFiles(serials: Record<string, string>) {
  return FOUR_PLACEMENTS.map((p) => ({ fileName: `walk-${p}.csv`, bytes: largeSensorCsv(serials[p]!, p, MAX_FILE) }));
}

function send(token: string | undefined, files: ReadonlyArray<{ fileName: string; bytes: Buffer }>, extra: Partial<Parameters<typeof writeAllThenRead>[0]> = {}): Promise<RawAnswer> {
  const boundary = `----pendula-test-${Math.random().toString(16).slice(2)}`;
  return writeAllThenRead({
    port,
    path: "/api/sessions",
    headers: { "Content-Type": `multipart/form-data; boundary=${boundary}`, ...(token ? { Authorization: `Bearer ${token}` } : {}) },
    body: multipartBody(boundary, files),
    ...extra,
  });
}

/** Every file (not folder) left under the upload root, and every per-request folder. */
function leftovers(): string[] {
  const found: string[] = [];
  const walk = (dir: string) => {
    for (const name of readdirSync(dir)) {
      const full = path.join(dir, name);
      if (statSync(full).isDirectory()) {
        if (name.startsWith("r-")) found.push(`${full}/`);
        walk(full);
      } else found.push(full);
    }
  };
  walk(path.join(tmpRoot, "uploads"));
  return found;
}

/** Folders are removed when the response closes, just after the answer; allow that moment. */
async function expectNoLeftovers(): Promise<void> {
  const deadline = Date.now() + 5000;
  while (leftovers().length > 0 && Date.now() < deadline) await new Promise((r) => setTimeout(r, 25));
  expect(leftovers()).toEqual([]);
}

async function waitFor(check: () => boolean, what: string): Promise<void> {
  const deadline = Date.now() + 15_000;
  while (!check()) {
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 20));
  }
}

describe("early refusals reach a client that writes the whole body before reading", () => {
  it("401 without a token, after an 8 MiB body: status, JSON error and Connection: close", async () => {
    const { serials } = await patientWithDevices("RF401");
    const before = await storedCounts(ctx);
    const res = await send(undefined, fourLargeFiles(serials));
    expect(res.socketError).toBeUndefined();
    expect(res.status).toBe(401);
    expect(res.headers.connection).toBe("close");
    expect(JSON.parse(res.body).error.code).toBe("unauthorized");
    expect(await storedCounts(ctx)).toEqual(before);
  });

  it("403 for a role that may not upload (researcher)", async () => {
    const { serials } = await patientWithDevices("RF403");
    const researcher = await ctx.seedUser({ role: "researcher" });
    const res = await send(await ctx.tokenFor(researcher), fourLargeFiles(serials));
    expect(res.socketError).toBeUndefined();
    expect(res.status).toBe(403);
    expect(res.headers.connection).toBe("close");
    expect(JSON.parse(res.body).error.code).toBe("forbidden");
  });

  it("413 for a 150 MB file against a 2 MiB limit, and nothing left on disk or stored", async () => {
    const { token } = await patientWithDevices("RF413");
    const mib = Buffer.alloc(1024 * 1024, "0.01,0.1,9.8,0.1,1.0,2.0,3.0\n");
    const before = await storedCounts(ctx);
    const res = await writeAllThenRead({
      port,
      path: "/api/sessions",
      headers: { "Content-Type": "multipart/form-data; boundary=big", Authorization: `Bearer ${token}` },
      body: multipartBody("big", [{ fileName: "huge.csv", bytes: Buffer.alloc(0) }]).flatMap((chunk, i) => (i === 1 ? Array.from({ length: 143 }, () => mib) : [chunk])),
    });
    expect(res.socketError).toBeUndefined();
    expect(res.status).toBe(413);
    expect(JSON.parse(res.body).error.code).toBe("payload_too_large");
    expect(await storedCounts(ctx)).toEqual(before);
    await expectNoLeftovers();
  });

  it("429 over the upload rate limit (3 per window here), readable after the whole body", async () => {
    const { token, serials } = await patientWithDevices("RF429");
    const tiny = [{ fileName: "x.csv", bytes: Buffer.from("not a sensor file\n") }];
    for (let i = 0; i < 3; i++) expect((await send(token, tiny)).status).toBe(422);
    const res = await send(token, fourLargeFiles(serials));
    expect(res.socketError).toBeUndefined();
    expect(res.status).toBe(429);
    expect(res.headers.connection).toBe("close");
    expect(JSON.parse(res.body).error.code).toBe("rate_limited");
    await expectNoLeftovers();
  });
});

describe("at most two uploads in flight per account", () => {
  it("a third concurrent upload is refused with 429 and Retry-After; the two in flight then complete", async () => {
    const { token, serials } = await patientWithDevices("RFCAP");
    const files = fourLargeFiles(serials);
    let release!: () => void;
    const released = new Promise<void>((r) => (release = r));
    const requestFolders = () => readdirSync(path.join(tmpRoot, "uploads")).flatMap((p) => readdirSync(path.join(tmpRoot, "uploads", p)).filter((n) => n.startsWith("r-")));
    // Two uploads stop half-way through their bodies, so they are certainly in flight.
    const held = [0, 1].map(() => send(token, files, { pauseAfter: { bytes: 3 * 1024 * 1024, until: () => released } }));
    await waitFor(() => requestFolders().length >= 2, "two uploads in flight");
    const third = await send(token, files);
    expect(third.socketError).toBeUndefined();
    expect(third.status).toBe(429);
    expect(third.headers["retry-after"]).toBe("10");
    const error = JSON.parse(third.body).error;
    expect(error.code).toBe("uploads_in_progress");
    expect(error.message).toMatch(/2 uploads from this account are still being received/);
    // Another account is not affected meanwhile.
    const other = await patientWithDevices("RFCAPB");
    const otherRes = await upload(ctx, other.token, synthFor(other.serials, { seed: 5 }).files);
    expect(otherRes.status, JSON.stringify(otherRes.body)).toBe(202);
    release();
    const done = await Promise.all(held);
    // Same bytes twice: one stored (202), the other its duplicate (200).
    expect(done.map((d) => d.status).sort()).toEqual([200, 202]);
    // The slots are free again.
    const again = await upload(ctx, token, synthFor(serials, { seed: 6 }).files);
    expect(again.status, JSON.stringify(again.body)).toBe(202);
    await expectNoLeftovers();
  });
});

describe("upload bodies on disk", () => {
  it("live in private folders (mode 700) and are gone after success, 422 and a client that disconnects mid-body", async () => {
    const { token, serials } = await patientWithDevices("RFTMP");
    const ok = await upload(ctx, token, synthFor(serials, { seed: 8 }).files);
    expect(ok.status, JSON.stringify(ok.body)).toBe(202);
    await expectNoLeftovers();

    const unknown = synthFor({ left_shank: "NOT-REGISTERED-1", right_shank: serials.right_shank!, left_wrist: serials.left_wrist!, right_wrist: serials.right_wrist! }, { seed: 9 }).files;
    const refused = await upload(ctx, token, unknown);
    expect(refused.status).toBe(422);
    expect(refused.body.error.code).toBe("unknown_device");
    await expectNoLeftovers();

    const root = path.join(tmpRoot, "uploads");
    expect(statSync(root).mode & 0o777).toBe(0o700);
    for (const p of readdirSync(root)) expect(statSync(path.join(root, p)).mode & 0o777).toBe(0o700);

    // A client that goes away half-way: its partial body must not stay behind.
    const before = await storedCounts(ctx);
    let stop!: () => void;
    const stopped = new Promise<void>((r) => (stop = r));
    const abandoned = send(token, fourLargeFiles(serials), {
      pauseAfter: { bytes: 3 * 1024 * 1024, until: () => stopped.then(() => Promise.reject(new Error("client gone"))) },
    });
    await waitFor(() => leftovers().some((f) => !f.endsWith("/")), "the partial body on disk");
    stop();
    await expect(abandoned).rejects.toThrow("client gone");
    await expectNoLeftovers();
    expect(await storedCounts(ctx)).toEqual(before);
  });

  it("makes the process's folder again when a temp cleaner removed it", async () => {
    const { token, serials } = await patientWithDevices("RFCLN");
    const root = path.join(tmpRoot, "uploads");
    for (const p of readdirSync(root)) rmSync(path.join(root, p), { recursive: true, force: true });
    const res = await upload(ctx, token, synthFor(serials, { seed: 10 }).files);
    expect(res.status, JSON.stringify(res.body)).toBe(202);
    await expectNoLeftovers();
  });
});
