import { screen, waitFor, within } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { afterEach, describe, expect, it, vi } from "vitest";
import { synthesizeSession } from "@pendula/signal";
import { sessionDetailFixture } from "@/testing/contract-fixtures";
import { renderWithProviders } from "@/testing/render";
import { WeeklyWalk } from "../components/weekly-walk";
import { PREPARATION_ITEMS } from "../components/safety-checklist";
import { runPrecheck } from "../precheck/run-precheck";

const inputOf = (name: string, text: string) => {
  const bytes = new TextEncoder().encode(text);
  return { name, sizeBytes: bytes.length, bytes };
};

afterEach(() => vi.unstubAllGlobals());

async function passChecklist(user: ReturnType<typeof userEvent.setup>) {
  for (const box of screen.getAllByRole("checkbox")) await user.click(box);
  await user.click(screen.getByRole("button", { name: /add my sensor files/i }));
}

describe("safety checklist gates the upload", () => {
  it("shows no file input until every item and the stop rules are acknowledged", async () => {
    const user = userEvent.setup();
    renderWithProviders(<WeeklyWalk />);
    expect(screen.queryByLabelText(/choose files/i)).toBeNull();

    const boxes = screen.getAllByRole("checkbox");
    expect(boxes).toHaveLength(PREPARATION_ITEMS.length + 1);
    // Tick all but the stop-rule acknowledgement: still gated, and the person is told why.
    for (const box of boxes.slice(0, -1)) await user.click(box);
    await user.click(screen.getByRole("button", { name: /add my sensor files/i }));
    expect(screen.getByRole("alert").textContent).toMatch(/One item is not ticked yet/);
    expect(screen.queryByLabelText(/choose files/i)).toBeNull();

    await user.click(boxes[boxes.length - 1]!);
    await user.click(screen.getByRole("button", { name: /add my sensor files/i }));
    expect(screen.getByLabelText(/choose files/i)).toBeTruthy();
  });

  it("names the stop rules and says falls are not detected", () => {
    renderWithProviders(<WeeklyWalk />);
    expect(screen.getByText("chest pain or tightness")).toBeTruthy();
    expect(screen.getByText(/a freezing episode/)).toBeTruthy();
    expect(screen.getByText(/Pendula does not notice falls and cannot call for help/)).toBeTruthy();
  });
});

describe("in-browser pre-check", () => {
  it("summarises a synthetic four-sensor session before anything is uploaded", async () => {
    const fetchSpy = vi.fn();
    vi.stubGlobal("fetch", fetchSpy);
    const session = synthesizeSession({ seed: 7, durationS: 60, sampleRateHz: 100, strideTimeS: 1.1 });
    const files = session.files.map((f) => new File([f.text], f.fileName, { type: "text/csv" }));
    const user = userEvent.setup();
    renderWithProviders(<WeeklyWalk />);
    await passChecklist(user);
    await user.upload(screen.getByLabelText(/choose files/i), files);

    const summary = await screen.findByRole("region", { name: "Check of your recording" }, { timeout: 20_000 });
    expect(within(summary).getByText(`${files.length} of ${files.length}`)).toBeTruthy();
    for (const f of session.files) {
      expect(within(summary).getByText(f.fileName)).toBeTruthy();
      expect(within(summary).getByText(f.deviceSerial)).toBeTruthy();
    }
    // Placements come from the "# placement:" header lines the generator writes.
    expect(within(summary).getAllByText("left lower leg").length).toBeGreaterThan(0);
    expect(within(summary).getAllByText("right wrist").length).toBeGreaterThan(0);
    expect(fetchSpy).not.toHaveBeenCalled();
    expect(screen.getByRole("button", { name: /send to my care team|send anyway/i })).toBeTruthy();
  }, 30_000);

  it("finds the generator's strides and duration (truth from the generator's own events)", () => {
    const session = synthesizeSession({ seed: 3, durationS: 60, sampleRateHz: 100, strideTimeS: 1.1 });
    const summary = runPrecheck(session.files.map((f) => inputOf(f.fileName, f.text)));
    const truthStrides = session.truth.left.strideTimesS.length + session.truth.right.strideTimesS.length;
    expect(summary.files.every((f) => f.recognised)).toBe(true);
    expect(Math.abs(summary.strideCount - truthStrides)).toBeLessThanOrEqual(2);
    expect(summary.durationS).toBeGreaterThan(55);
    expect(summary.durationS).toBeLessThan(65);
    // Cadence = 120 / mean stride time (Mobilise-D definitions;
    // docs/methods.md#stride-step-and-cadence): 120 / 1.1 s = 109.09 steps/min.
    expect(summary.cadenceStepsPerMin).not.toBeNull();
    expect(Math.abs(summary.cadenceStepsPerMin! - 120 / 1.1)).toBeLessThan(2);
    expect(summary.verdict).not.toBe("redo");
  }, 30_000);

  it("says in plain words when a file is not a sensor recording", () => {
    const summary = runPrecheck([inputOf("shopping-list.csv", "milk,eggs\nbread,tea\n")]);
    expect(summary.verdict).toBe("redo");
    expect(summary.files[0]!.recognised).toBe(false);
    expect(summary.notices[0]!.text).toMatch(/shopping-list\.csv could not be read/);
  });

  it("reports that no walking was found in a standing-only recording", () => {
    const session = synthesizeSession({ seed: 5, durationS: 30, standing: [{ startS: 0, durationS: 30 }] });
    const summary = runPrecheck(session.files.map((f) => inputOf(f.fileName, f.text)));
    expect(summary.verdict).toBe("redo");
  }, 30_000);
});

describe("upload after the check", () => {
  it("posts the files as multipart `files` and follows processing until done", async () => {
    const session = synthesizeSession({ seed: 11, durationS: 40 });
    const files = session.files.map((f) => new File([f.text], f.fileName, { type: "text/csv" }));
    const { sent, polls } = fakeUploadServer(files);

    const user = userEvent.setup();
    renderWithProviders(<WeeklyWalk />);
    await passChecklist(user);
    await user.upload(screen.getByLabelText(/choose files/i), files);
    await user.click(await screen.findByRole("button", { name: /send to my care team|send anyway/i }, { timeout: 20_000 }));

    await waitFor(() => expect(sent).toHaveLength(1));
    expect(sent[0]!.getAll("files").map((f) => (f as File).name)).toEqual(files.map((f) => f.name));
    expect(await screen.findByText(/This week's walk has been measured/, {}, { timeout: 10_000 })).toBeTruthy();
    expect(polls()).toBeGreaterThanOrEqual(2);
    expect(sent[0]!.get("startUtc")).toBeNull();
  }, 40_000);

  it("asks when a BIDS Motion set was walked and sends it as startUtc", async () => {
    const session = synthesizeSession({ seed: 12, durationS: 30, placements: ["left_shank"] });
    const rows = session.files[0]!.text
      .split("\n")
      .filter((l) => /^\d/.test(l))
      .map((l) => l.split(",").join("\t"));
    const stem = "sub-03_task-walk_tracksys-imu";
    const channels = [
      "name\tcomponent\ttype\ttracked_point\tunits",
      "t\tn/a\tLATENCY\tn/a\ts",
      ...["x", "y", "z"].map((c) => `acc_${c}\t${c}\tACCEL\tLeftShank\tm/s^2`),
      ...["x", "y", "z"].map((c) => `gyro_${c}\t${c}\tGYRO\tLeftShank\tdeg/s`),
    ];
    const files = [
      new File([rows.join("\n")], `${stem}_motion.tsv`, { type: "text/tab-separated-values" }),
      new File([channels.join("\n")], `${stem}_channels.tsv`, { type: "text/tab-separated-values" }),
      new File([JSON.stringify({ SamplingFrequency: 100, TrackingSystemName: "imu" })], `${stem}_motion.json`, { type: "application/json" }),
    ];
    const { sent } = fakeUploadServer(files);

    const user = userEvent.setup();
    renderWithProviders(<WeeklyWalk />);
    await passChecklist(user);
    await user.upload(screen.getByLabelText(/choose files/i), files);
    const when = await screen.findByLabelText(/when did you do this walk/i, {}, { timeout: 20_000 });
    // The data file's sensor column names the tracking system (its sensors are the positions).
    expect(screen.getByText("imu")).toBeTruthy();
    await user.clear(when);
    await user.type(when, "2026-11-20T08:30");
    await user.click(await screen.findByRole("button", { name: /send to my care team|send anyway/i }));

    await waitFor(() => expect(sent).toHaveLength(1));
    expect(sent[0]!.get("startUtc")).toBe(new Date("2026-11-20T08:30").toISOString());
    expect(sent[0]!.getAll("files")).toHaveLength(3);
  }, 40_000);
});

/** XMLHttpRequest (the upload, for progress events) and fetch (status polling) answered in-process. */
function fakeUploadServer(files: File[]) {
  const sent: FormData[] = [];
  class FakeXhr {
    status = 0;
    statusText = "";
    responseText = "";
    upload = { onprogress: null as null | ((e: { loaded: number; total: number; lengthComputable: boolean }) => void) };
    onload: null | (() => void) = null;
    onerror: null | (() => void) = null;
    onabort: null | (() => void) = null;
    withCredentials = false;
    url = "";
    open(_m: string, url: string) {
      this.url = url;
    }
    setRequestHeader() {}
    abort() {}
    send(body: FormData) {
      sent.push(body);
      const total = files.reduce((s, f) => s + f.size, 0);
      setTimeout(() => {
        this.upload.onprogress?.({ loaded: total, total, lengthComputable: true });
        this.status = 202;
        this.responseText = JSON.stringify({ id: "0b7c2a8e-1d1f-4c61-9a39-3f1f6f1b2a10", status: "queued" });
        this.onload?.();
      }, 5);
    }
  }
  vi.stubGlobal("XMLHttpRequest", FakeXhr);
  let polls = 0;
  vi.stubGlobal(
    "fetch",
    vi.fn(async () => {
      polls += 1;
      const status = polls < 2 ? "processing" : "done";
      const session = sessionDetailFixture({ id: "0b7c2a8e-1d1f-4c61-9a39-3f1f6f1b2a10", status, progressPct: status === "done" ? 100 : 50 });
      return new Response(JSON.stringify(session), { status: 200 });
    }),
  );
  return { sent, polls: () => polls };
}
