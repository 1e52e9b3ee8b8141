import { act, renderHook, screen, waitFor } from "@testing-library/react";
import { render } from "@testing-library/react";
import { QueryClient, QueryClientProvider } from "@tanstack/react-query";
import type { ReactNode } from "react";
import { afterEach, describe, expect, it, vi } from "vitest";
import { PrecheckProgressView } from "../components/precheck-progress";
import { PrecheckCancelled, usePrecheck } from "../precheck/use-precheck";
import type { PrecheckWorkerMessage } from "../precheck/precheck-types";

/** Stands in for the browser's Worker: records what the page posts and lets the test answer. */
class FakeWorker {
  static last: FakeWorker | null = null;
  onmessage: ((e: MessageEvent<PrecheckWorkerMessage>) => void) | null = null;
  onerror: ((e: ErrorEvent) => void) | null = null;
  posted: unknown[] = [];
  terminated = false;
  constructor() {
    FakeWorker.last = this;
  }
  postMessage(data: unknown) {
    this.posted.push(data);
  }
  terminate() {
    this.terminated = true;
  }
  say(message: PrecheckWorkerMessage) {
    this.onmessage?.({ data: message } as MessageEvent<PrecheckWorkerMessage>);
  }
}

const wrapper = ({ children }: { children: ReactNode }) => (
  <QueryClientProvider client={new QueryClient({ defaultOptions: { mutations: { retry: false } } })}>{children}</QueryClientProvider>
);

afterEach(() => {
  vi.unstubAllGlobals();
  FakeWorker.last = null;
});

describe("PrecheckProgressView", () => {
  it("is a progress bar with its value and words, and offers to stop", () => {
    const onStop = vi.fn();
    render(<PrecheckProgressView progress={{ stage: "reading", fileNumber: 2, fileCount: 4, fraction: 0.2 }} onStop={onStop} />);
    const bar = screen.getByRole("progressbar");
    expect(bar.getAttribute("aria-valuenow")).toBe("20");
    expect(bar.getAttribute("aria-valuetext")).toBe("20 %: Reading file 2 of 4…");
    screen.getByRole("button", { name: /stop and remove/i }).click();
    expect(onStop).toHaveBeenCalledOnce();
  });
});

describe("usePrecheck()", () => {
  const files = [new File(["a"], "left.csv"), new File(["b"], "right.csv")];

  it("posts the File objects to the worker, follows its progress and ends with its summary", async () => {
    vi.stubGlobal("Worker", FakeWorker);
    const { result } = renderHook(() => usePrecheck(), { wrapper });
    act(() => result.current.mutate(files));
    await waitFor(() => expect(FakeWorker.last?.posted).toHaveLength(1));
    const worker = FakeWorker.last!;
    expect(worker.posted[0]).toEqual(files);
    act(() => worker.say({ kind: "progress", progress: { stage: "analysing", fileCount: 2, fraction: 0.55 } }));
    expect(result.current.progress).toEqual({ stage: "analysing", fileCount: 2, fraction: 0.55 });
    const summary = { files: [], placements: [], durationS: null, strideCount: 0, steadyStrideCount: 0, cadenceStepsPerMin: null, notices: [], verdict: "redo", analysisProblem: "x" } as const;
    act(() => worker.say({ kind: "done", summary: { ...summary, files: [], placements: [], notices: [] } }));
    await waitFor(() => expect(result.current.isSuccess).toBe(true));
    expect(result.current.data?.analysisProblem).toBe("x");
    // A finished worker closes itself; a later reset has nothing to stop.
    act(() => result.current.reset());
    expect(worker.terminated).toBe(false);
  });

  it("stops the worker when the files are removed, and a late answer changes nothing", async () => {
    vi.stubGlobal("Worker", FakeWorker);
    const { result } = renderHook(() => usePrecheck(), { wrapper });
    act(() => result.current.mutate(files));
    await waitFor(() => expect(FakeWorker.last).not.toBeNull());
    const worker = FakeWorker.last!;
    act(() => result.current.reset());
    expect(worker.terminated).toBe(true);
    expect(result.current.progress).toBeNull();
    act(() => worker.say({ kind: "progress", progress: { stage: "parsing", fileCount: 2, fraction: 0.4 } }));
    expect(result.current.progress).toBeNull();
    expect(result.current.isPending).toBe(false);
    expect(result.current.data).toBeUndefined();
  });

  it("a new set of files stops the previous check", async () => {
    vi.stubGlobal("Worker", FakeWorker);
    const { result } = renderHook(() => usePrecheck(), { wrapper });
    act(() => result.current.mutate(files));
    await waitFor(() => expect(FakeWorker.last).not.toBeNull());
    const first = FakeWorker.last!;
    act(() => result.current.mutate([files[0]!]));
    await waitFor(() => expect(FakeWorker.last).not.toBe(first));
    expect(first.terminated).toBe(true);
    expect(FakeWorker.last!.terminated).toBe(false);
    expect(new PrecheckCancelled().name).toBe("PrecheckCancelled");
  });
});
