import { render } from "@testing-library/react";
import { describe, expect, it } from "vitest";
import { TimeSeriesChartFixed } from "../time-series-chart";

const day = (d: number) => new Date(Date.UTC(2026, 8, d));

function tickLabels(container: HTMLElement): string[] {
  // The left axis is the one whose labels are anchored at the end.
  return [...container.querySelectorAll("text[text-anchor='end']")].map((t) => t.textContent ?? "");
}

describe("TimeSeriesChartFixed(props)", () => {
  it("gives the y axis enough decimals that no two ticks read the same (0.7–0.8 m with a 1-decimal metric format)", () => {
    const points = [0.72, 0.75, 0.79, 0.81, 0.84].map((v, i) => ({ key: String(i), t: day(i * 7 + 1), v }));
    const { container } = render(
      <TimeSeriesChartFixed ariaLabel="Stride length" width={600} series={[{ id: "s", label: "Stride length", points, color: "black" }]} formatY={(v) => v.toFixed(1)} />,
    );
    const labels = tickLabels(container);
    expect(labels.length).toBeGreaterThan(2);
    expect(new Set(labels).size).toBe(labels.length);
    expect(labels.every((l) => /^0\.\d{2}$/.test(l))).toBe(true);
  });

  it("keeps the metric's own format when it already tells the ticks apart", () => {
    const points = [95, 101, 108, 112].map((v, i) => ({ key: String(i), t: day(i * 7 + 1), v }));
    const { container } = render(
      <TimeSeriesChartFixed ariaLabel="Cadence" width={600} series={[{ id: "c", label: "Cadence", points, color: "black" }]} formatY={(v) => `${v.toFixed(0)}`} />,
    );
    const labels = tickLabels(container);
    expect(labels.length).toBeGreaterThan(2);
    expect(labels.every((l) => /^\d+$/.test(l))).toBe(true);
  });
});
