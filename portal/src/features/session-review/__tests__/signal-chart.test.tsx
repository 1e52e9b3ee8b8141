import { screen } from "@testing-library/react";
import { describe, expect, it } from "vitest";
import { renderWithProviders } from "@/testing/render";
import { SignalChart, type Trace } from "../components/signal-chart";

// A 1 Hz stride rhythm: a positive mid-swing peak each second with contacts either side of it,
// as in the shank pattern of Aminian et al. 2002 (IC = minimum after mid-swing, FC = minimum before).
function trace(): Trace {
  const timeS: number[] = [];
  const value: number[] = [];
  for (let i = 0; i <= 2000; i++) {
    const t = i / 100;
    timeS.push(t);
    value.push(300 * Math.max(0, Math.sin(2 * Math.PI * (t - 0.1))) - 60);
  }
  const ic = Array.from({ length: 20 }, (_, k) => k + 0.62);
  const fc = Array.from({ length: 20 }, (_, k) => k + 0.08);
  return { id: "l", label: "Left shank", color: "var(--color-moss)", timeS, value, initialContacts: ic, finalContacts: fc };
}

describe("session signal chart", () => {
  it("draws IC and FC markers for the events in the visible window", async () => {
    const { container } = renderWithProviders(<SignalChart traces={[trace()]} durationS={20} />);
    expect(await screen.findByRole("img", { name: /Sagittal angular velocity from 0.0 s to 12.0 s/ })).toBeTruthy();
    // The first view shows 0–12 s: events at k + 0.62 and k + 0.08 for k = 0..11.
    expect(container.querySelectorAll('[data-event="IC"]')).toHaveLength(12);
    expect(container.querySelectorAll('[data-event="FC"]')).toHaveLength(12);
    expect(screen.getAllByText(/Left shank initial contact at 0.62 s/).length).toBe(1);
  });

  it("zooms and pans with keyboard-usable buttons", async () => {
    const { default: userEvent } = await import("@testing-library/user-event");
    const user = userEvent.setup();
    const { container } = renderWithProviders(<SignalChart traces={[trace()]} durationS={20} />);
    // The plot draws once its container has been measured, which can come after the buttons.
    await screen.findByRole("img", { name: /from 0.0 s to 12.0 s/ });
    await user.click(screen.getByRole("button", { name: "Whole recording" }));
    expect(container.querySelectorAll('[data-event="IC"]')).toHaveLength(20);
    await user.click(screen.getByRole("button", { name: "Zoom in" }));
    expect(screen.getByRole("img", { name: /from 5.0 s to 15.0 s/ })).toBeTruthy();
    expect(container.querySelectorAll('[data-event="IC"]')).toHaveLength(10);
  });
});
