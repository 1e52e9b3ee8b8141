import { render, screen } from "@testing-library/react";
import { describe, expect, it } from "vitest";
import { METRICS, labelWithUnit } from "@pendula/ingest-server/contracts";
import { DEFAULT_COHORT } from "../api/cohort-definition";
import { CohortBuilderForm } from "../components/cohort-builder-form";

describe("the cohort builder names every metric from the one catalogue", () => {
  it("offers one checkbox per catalogue entry, labelled with the catalogue's label and unit", () => {
    render(<CohortBuilderForm initial={DEFAULT_COHORT} onSubmit={() => {}} />);
    const group = screen.getByRole("group", { name: "Metrics" });
    const labels = [...group.querySelectorAll("label")].map((l) => l.textContent);
    expect(labels).toEqual(METRICS.map((m) => labelWithUnit(m)));
    // The default cohort's metrics start ticked, by key.
    const ticked = [...group.querySelectorAll<HTMLInputElement>("input:checked")].map((i) => i.parentElement!.textContent);
    expect(ticked).toEqual(METRICS.filter((m) => DEFAULT_COHORT.metrics.includes(m.key)).map((m) => labelWithUnit(m)));
  });
});
