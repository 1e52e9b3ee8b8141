import { screen, within } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import { patientDetailFixture, sessionPageFixture, testUuid, trendMetricFixture, trendsFixture } from "@/testing/contract-fixtures";
import type { WalkingAid } from "@pendula/ingest-server/contracts";
import { mockApi } from "@/testing/mock-api";
import { createTestQueryClient, renderWithProviders } from "@/testing/render";
import { PatientTrendsPage } from "../components/patient-trends-page";
import { bandVerdicts, summaryGroups, wrapDeg } from "../components/trend-summary-model";
import type { TrendMetric } from "../api/trends";

// An invented patient and four invented weekly walks.
const PID = "3d6e9b1a-8c2f-4e07-a5d1-0f4b7c9e2a66";
const at = (i: number) => new Date(Date.UTC(2026, 9, 5 + 7 * i, 10)).toISOString();
const NO_BAND = "No published band for this patient: the published cohorts for this measure differ in age or condition.";
const FRENKEL = "Frenkel-Toledo et al. 2005, J NeuroEng Rehabil 2:23, Table 2 (overground, comfortable speed)";
// Frenkel-Toledo et al. 2005, Table 2: stride-time CV of controls 1.94 ± 0.36 %, of Parkinson's disease 2.24 ± 0.74 %.
// The bands are mean ± 1 SD worked out here from those published numbers.
const CONTROL_BAND = { low: 1.94 - 0.36, high: 1.94 + 0.36, label: "Control group, mean ± 1 SD (1.94 ± 0.36 %)", citation: FRENKEL };
const PD_BAND = { low: 2.24 - 0.74, high: 2.24 + 0.74, label: "Parkinson's disease group, mean ± 1 SD (2.24 ± 0.74 %)", citation: FRENKEL };

type Pt = Record<string, unknown>;
const sid = (i: number) => testUuid(i + 1, "5e550000");
/** Points as the trends route sends them: the first three sessions form the baseline. */
const series = (values: number[], last: Pt = {}, each: (i: number) => Pt = () => ({})) =>
  values.map((v, i) => ({
    sessionId: sid(i),
    recordedAt: at(i),
    value: v,
    ...(i < 3 ? { baseline: true } : {}),
    ...each(i),
    ...(i === values.length - 1 ? last : {}),
  }));

const AIDS: WalkingAid[] = ["cane", "cane", "cane", "none"];
const mean3 = (v: number[]) => (v[0]! + v[1]! + v[2]!) / 3;
const SPEED = [0.62, 0.66, 0.74, 0.81];
const CV = [2.1, 2.3, 2.2, 3.4];

function trendsBody(overrides: { rightCouplingLast?: boolean } = {}) {
  const rightR = [0.3, 0.25, 0.2, 0.12];
  return trendsFixture({
    patientId: PID,
    metrics: [
      {
        key: "cadenceStepsPerMin",
        unit: "/min",
        label: "Cadence (steps/min)",
        countNoun: "strides",
        points: series([96, 98, 97, 99.5], { flag: "within-error" }, (i) => ({ n: 40 + i })),
        baseline: { mean: 97, sd: 1, n: 3 },
        mdc: { value: 5.2, source: "patient-baseline" },
        direction: "higher-is-better",
        bands: [],
        bandNote: NO_BAND,
      },
      {
        key: "walkingSpeedMPerS",
        unit: "m/s",
        label: "Walking speed",
        countNoun: "strides",
        points: series(SPEED, { flag: "improved" }, (i) => ({ n: 30 + i, walkingAid: AIDS[i] })),
        baseline: { mean: mean3(SPEED), sd: 0.06, n: 3 },
        mdc: { value: 0.1, source: "patient-baseline" },
        direction: "higher-is-better",
        bands: [],
        bandNote: NO_BAND,
      },
      {
        key: "strideTimeCvPct",
        unit: "%",
        label: "Stride-time variability (CV)",
        countNoun: "strides",
        points: series(CV, { flag: "worsened" }, (i) => ({ n: 36, walkingSpeedMPerS: SPEED[i] })),
        baseline: { mean: mean3(CV), sd: 0.1, n: 3 },
        mdc: { value: 0.9, source: "patient-baseline" },
        direction: "higher-is-worse",
        bands: [CONTROL_BAND, PD_BAND],
        bandNote: null,
      },
      {
        key: "stancePctLeft",
        unit: "%",
        label: "Stance, left",
        points: series([64, 63, 65, 61]),
        baseline: { mean: 64, sd: 1, n: 3 },
        mdc: { value: 2.5, source: "patient-baseline" },
        direction: null,
        bands: [],
        bandNote: NO_BAND,
      },
      {
        key: "armLegLeftArmRightLegCouplingStrength",
        unit: "1",
        label: "Left arm–right leg coupling strength (R)",
        points: series([0.8, 0.82, 0.79, 0.8]),
        baseline: { mean: 0.8, sd: 0.015, n: 3 },
        mdc: null,
        direction: null,
        bands: [],
        bandNote: "No published reference band for this measure.",
      },
      {
        key: "armLegLeftArmRightLegMeanRelativePhaseDeg",
        unit: "deg",
        label: "Left arm–right leg mean relative phase",
        // Across ±180°: the baseline mean −178° and the latest 175° are 7° apart.
        points: series([-176, -179, -179, 175], { flag: "within-error" }),
        baseline: { mean: -178, sd: 1.7, n: 3 },
        mdc: { value: 12, source: "patient-baseline" },
        direction: null,
        bands: [],
        bandNote: "No published reference band for this measure.",
      },
      {
        key: "armLegRightArmLeftLegCouplingStrength",
        unit: "1",
        label: "Right arm–left leg coupling strength (R)",
        points: series(overrides.rightCouplingLast === false ? rightR.slice(0, 3) : rightR),
        baseline: { mean: 0.25, sd: 0.05, n: 3 },
        mdc: null,
        direction: null,
        bands: [],
      },
      {
        key: "armLegRightArmLeftLegMeanRelativePhaseDeg",
        unit: "deg",
        label: "Right arm–left leg mean relative phase",
        points: series([30, 35, 25, 40], { excludedReason: "weak-coupling" }),
        baseline: { mean: 30, sd: 5, n: 3 },
        mdc: { value: 15, source: "patient-baseline" },
        direction: null,
        bands: [],
      },
    ],
    events: [],
    cautions: ["A flag or event is a prompt to look at the recording and the patient, not a diagnosis."],
  });
}

function server(body = trendsBody()) {
  return mockApi({
    [`GET /api/patients/${PID}`]: { body: patientDetailFixture({ id: PID, displayName: "Ilse Varga-Moreau", condition: "stroke", heightCm: 171 }) },
    [`GET /api/patients/${PID}/sessions`]: {
      body: sessionPageFixture(AIDS.map((aid, i) => ({ id: sid(i), patientId: PID, status: "done", recordedAt: at(i), walkingAid: aid }))),
    },
    [`GET /api/patients/${PID}/trends`]: { body },
  });
}

async function summary() {
  renderWithProviders(<PatientTrendsPage patientId={PID} />, { queryClient: createTestQueryClient() });
  return screen.findByRole("table", { name: /Latest value of each measure/ });
}

/** The summary row whose measure link reads `label`. */
function rowOf(table: HTMLElement, label: string) {
  const link = within(table).getByRole("link", { name: label });
  const row = link.closest("tr");
  if (!row) throw new Error(`no row for ${label}`);
  return { row, cells: [...row.querySelectorAll("td")].map((td) => td.textContent ?? "") };
}

afterEach(() => vi.unstubAllGlobals());

describe("trend summary at the top of the patient's trends", () => {
  it("comes before the first chart and says it supports, not replaces, clinical judgement", async () => {
    server();
    const table = await summary();
    const firstCard = screen.getAllByRole("region").find((r) => r.id.startsWith("trend-card-"))!;
    expect(table.compareDocumentPosition(firstCard) & Node.DOCUMENT_POSITION_FOLLOWING).toBeTruthy();
    expect(screen.getByText(/This summary supports, and does not replace, clinical judgement/)).toBeTruthy();
  });

  it("lists the latest value with its unit and count, the change from the baseline mean and the server's MDC verdict", async () => {
    server();
    const table = await summary();

    const speed = rowOf(table, "Walking speed");
    expect(speed.cells[0]).toMatch(/^0\.81 m\/s · n = 33 strides$/);
    // 0.81 − mean(0.62, 0.66, 0.74) = 0.81 − 0.6733 = +0.1367, shown to two decimals.
    expect(speed.cells[1]).toMatch(/^\+0\.14 m\/s \(MDC95 0\.10 m\/s\)/);
    expect(speed.cells[2]).toBe("Improved beyond MDC");
    // The latest walk was without the cane used in every baseline walk.
    expect(speed.cells[1]).toMatch(/Walking aid differs from baseline/);

    const cv = rowOf(table, "Stride-time variability (CV)");
    expect(cv.cells[0]).toMatch(/^3\.40 % · n = 36 strides · at 0\.81 m\/s$/);
    expect(cv.cells[1]).toMatch(/^\+1\.20 %/);
    expect(cv.cells[2]).toBe("Worsened beyond MDC");

    const cadence = rowOf(table, "Cadence (steps/min)");
    expect(cadence.cells[0]).toMatch(/^99\.5 steps\/min · n = 43 strides$/);
    expect(cadence.cells[2]).toBe("Within MDC");

    // No improved/worsened flag exists for stance (no agreed direction): the summary says so rather than guessing.
    expect(rowOf(table, "Stance, left").cells[2]).toBe("Not compared (no agreed direction)");
  });

  it("places the latest value against each published band shown for this patient (Frenkel-Toledo et al. 2005, Table 2)", async () => {
    server();
    const table = await summary();
    // 3.4 % lies above 1.94 + 0.36 = 2.30 % and above 2.24 + 0.74 = 2.98 %.
    expect(rowOf(table, "Stride-time variability (CV)").cells[3]).toBe("↑Above band 1 (1.58–2.30 %)↑Above band 2 (1.50–2.98 %)");
    // The band numbers are the card's own.
    const card = screen.getByRole("region", { name: /Stride-time variability/ });
    const items = within(card).getAllByRole("listitem").map((li) => li.textContent ?? "");
    expect(items.find((t) => t.includes("Control group"))).toMatch(/^Band 1:/);
    expect(items.find((t) => t.includes("Parkinson's disease group"))).toMatch(/^Band 2:/);
  });

  it("says there is no published band for a patient with none", async () => {
    server();
    const table = await summary();
    expect(rowOf(table, "Walking speed").cells[3]).toBe("No published band for this patient");
    expect(rowOf(table, "Cadence (steps/min)").cells[3]).toBe("No published band for this patient");
  });

  it("links every measure to a chart card that exists on the page", async () => {
    server();
    const table = await summary();
    const links = within(table).getAllByRole("link");
    expect(links.length).toBe(8);
    for (const link of links) {
      const href = link.getAttribute("href") ?? "";
      expect(href).toMatch(/^#trend-card-/);
      const target = document.getElementById(href.slice(1));
      expect(target, href).not.toBeNull();
      expect(target!.tagName).toBe("SECTION");
    }
    expect(within(table).getByRole("link", { name: "Walking speed" }).getAttribute("href")).toBe("#trend-card-speed");
    const phaseTarget = document.getElementById(within(table).getByRole("link", { name: "Left arm–right leg mean relative phase" }).getAttribute("href")!.slice(1))!;
    expect(within(phaseTarget).getByRole("heading", { level: 3 }).textContent).toMatch(/Arm–leg coupling strength/);
  });

  it("never shows a relative phase without the coupling strength R of the same pair and session", async () => {
    server();
    const table = await summary();
    const left = rowOf(table, "Left arm–right leg mean relative phase");
    expect(left.cells[0]).toBe("175.0° (R = 0.80)");
    // Wrapped the short way round: 175° − (−178°) = 353° ≡ −7°.
    expect(left.cells[1]).toMatch(/^−7\.00° \(MDC95 12\.00°\)/);
    expect(left.cells[2]).toBe("Within MDC");
    // Each phase row sits right after its own pair's R.
    const rows = [...table.querySelectorAll("tbody tr")].map((tr) => tr.querySelector("a")?.textContent);
    expect(rows.slice(-4)).toEqual([
      "Left arm–right leg coupling strength (R)",
      "Left arm–right leg mean relative phase",
      "Right arm–left leg coupling strength (R)",
      "Right arm–left leg mean relative phase",
    ]);

    const right = rowOf(table, "Right arm–left leg mean relative phase");
    expect(right.cells[0]).toBe("40.0° (R = 0.12)");
    expect(right.cells[1]).toBe("—");
    expect(right.cells[2]).toBe("Not compared (coupling too weak)");
  });

  it("withholds a phase whose session has no R", async () => {
    server(trendsBody({ rightCouplingLast: false }));
    const table = await summary();
    const right = rowOf(table, "Right arm–left leg mean relative phase");
    expect(right.cells[0]).toBe("Phase withheld: no coupling strength R for this session");
    expect(right.cells[0]).not.toMatch(/40/);
  });

  it("gives verdicts in words with an icon, not colour alone", async () => {
    server();
    const table = await summary();
    for (const [label, words] of [
      ["Walking speed", "Improved beyond MDC"],
      ["Stride-time variability (CV)", "Worsened beyond MDC"],
      ["Cadence (steps/min)", "Within MDC"],
    ] as const) {
      const cell = rowOf(table, label).row.querySelectorAll("td")[2]!;
      expect(cell.textContent).toBe(words);
      expect(cell.querySelector("svg")).not.toBeNull();
    }
  });
});

describe("summary rules", () => {
  it.each([-540, -353, -190, -180, -7, 0, 7, 179.5, 180, 190, 353, 720.25])(
    "wrapDeg(%s) is the principal angle atan2(sin d, cos d) (ECMA-262 Math.atan2, range −π..π)",
    (d) => {
      const rad = (d * Math.PI) / 180;
      const principal = (Math.atan2(Math.sin(rad), Math.cos(rad)) * 180) / Math.PI;
      // atan2 gives −180 or 180 at the cut depending on rounding; the server's convention is (−180°, 180°].
      const expected = Math.abs(Math.abs(principal) - 180) < 1e-9 ? 180 : principal;
      expect(wrapDeg(d)).toBeCloseTo(expected, 9);
    },
  );

  it("reads inside, above and below from the band's own limits (Frenkel-Toledo et al. 2005, Table 2)", () => {
    const bands = trendMetricFixture({ key: "strideTimeCvPct", unit: "%", points: [], bands: [CONTROL_BAND, PD_BAND] }).bands;
    // 1.94 % is the control mean: inside both. 1.55 % is below 1.58 and above 1.50. 2.5 % is above 2.30, inside 2.98.
    expect(bandVerdicts(1.94, bands).map((v) => v.position)).toEqual(["inside", "inside"]);
    expect(bandVerdicts(1.55, bands).map((v) => v.position)).toEqual(["below", "inside"]);
    expect(bandVerdicts(2.5, bands).map((v) => v.position)).toEqual(["above", "inside"]);
    // A value on the limit is inside (mean ± 1 SD is a closed range).
    expect(bandVerdicts(1.94 + 0.36, bands)[0]!.position).toBe("inside");
  });

  it("leaves out a phase when the page draws no coupling strength, and metrics with no card", () => {
    const m = (key: string): TrendMetric => trendMetricFixture({ key, unit: "deg", points: [{ sessionId: sid(0), recordedAt: at(0), value: 10 }] });
    const groups = summaryGroups([m("armLegLeftArmRightLegMeanRelativePhaseDeg"), m("gaitAsymmetryPct"), m("cadenceStepsPerMin")]);
    expect(groups.map((g) => g.family.id)).toEqual(["cadence"]);
  });

  it("does not invent a comparison the server did not make", () => {
    const base: TrendMetric = trendMetricFixture({ key: "cadenceStepsPerMin", unit: "/min", points: [], baseline: null, mdc: null, direction: "higher-is-better" });
    const p = (extra: Pt) => ({ sessionId: sid(9), recordedAt: at(9), value: 100, n: null, walkingAid: null, ...extra });
    const baseline = (mean: number) => ({ mean, sd: 1, n: 3 });
    const verdict = (metric: TrendMetric) => summaryGroups([metric])[0]!.rows[0]!.change;
    expect(verdict({ ...base, points: [p({})] })).toEqual({ kind: "not-compared", reason: "no baseline yet" });
    expect(verdict({ ...base, points: [p({ baseline: true })], baseline: baseline(100) })).toEqual({ kind: "not-compared", reason: "baseline session" });
    expect(verdict({ ...base, points: [p({ excludedReason: "few-strides" })], baseline: baseline(90) })).toEqual({ kind: "not-compared", reason: "too few strides" });
    expect(summaryGroups([{ ...base, points: [p({ excludedReason: "few-strides" })], baseline: baseline(90) }])[0]!.rows[0]!.delta).toBeNull();
    expect(verdict({ ...base, points: [p({})], baseline: baseline(90) })).toEqual({ kind: "not-compared", reason: "no MDC" });
  });
});
