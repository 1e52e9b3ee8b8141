import { afterEach } from "vitest";
import { cleanup } from "@testing-library/react";

afterEach(() => cleanup());

// jsdom has no layout, so there is no ResizeObserver. Charts measure their parent through it:
// report a fixed 720 px wide box so responsive charts render in component tests.
if (!("ResizeObserver" in globalThis)) {
  class FixedSizeResizeObserver {
    constructor(private readonly callback: ResizeObserverCallback) {}
    observe(target: Element) {
      const rect = { left: 0, top: 0, width: 720, height: 240, right: 720, bottom: 240, x: 0, y: 0, toJSON: () => ({}) };
      this.callback([{ target, contentRect: rect } as unknown as ResizeObserverEntry], this as unknown as ResizeObserver);
    }
    unobserve() {}
    disconnect() {}
  }
  (globalThis as { ResizeObserver?: unknown }).ResizeObserver = FixedSizeResizeObserver;
}
