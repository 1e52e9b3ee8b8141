import { METRIC_CHARTS, metricDefinition, type MetricChart } from "@pendula/ingest-server/contracts";
import type { TrendBand, TrendMetric } from "../api/trends";

export type TrendPoint = TrendMetric["points"][number];

/** The id of a family's chart card, so the summary (and anyone else) can link down to it. */
export const trendCardId = (familyId: string) => `trend-card-${familyId}`;

/**
 * The bands a family card draws, numbered in the card's order: one entry per distinct band even
 * when several series (left/right) carry it. The summary's "band 1" is the card's "Band 1".
 */
export function familyBands(metrics: TrendMetric[]): TrendBand[] {
  const bands: TrendBand[] = [];
  for (const m of metrics) for (const b of m.bands ?? []) if (!bands.some((x) => x.label === b.label && x.low === b.low)) bands.push(b);
  return bands;
}

export type ChangeVerdict =
  | { kind: "improved" | "worsened" | "changed" | "within" }
  | { kind: "not-compared"; reason: string };

export type BandPosition = "inside" | "above" | "below";
export interface BandVerdict {
  /** 1-based number of the band on the family card. */
  number: number;
  band: TrendBand;
  position: BandPosition;
}

export interface SummaryRow {
  metric: TrendMetric;
  label: string;
  latest: TrendPoint | null;
  /** True when the latest value is a mean relative phase: it is only ever shown with R beside it. */
  phase: boolean;
  /** Coupling strength R of the same arm–leg pair in the latest session, on phase rows only. */
  couplingR: number | null;
  /** Latest value minus the baseline mean (wrapped to ±180° for a phase); null when not compared. */
  delta: number | null;
  change: ChangeVerdict;
  /** Empty when no published band is shown for this patient. */
  bands: BandVerdict[];
  /** The walking aid of the latest session is not the one of every baseline session. */
  aidDiffers: boolean;
}

export interface SummaryGroup {
  family: MetricChart;
  rows: SummaryRow[];
}

// Everything about a key comes from the metric catalogue; a key it does not list has no chart, pair or phase.
const isPhaseKey = (key: string) => metricDefinition(key)?.base === "meanRelativePhaseDeg";
const pairOf = (key: string) => metricDefinition(key)?.pair ?? null;
const chartOf = (key: string) => metricDefinition(key)?.chart ?? null;

export const latestPoint = (m: TrendMetric): TrendPoint | null =>
  m.points.reduce<TrendPoint | null>((best, p) => (best === null || p.recordedAt > best.recordedAt ? p : best), null);

/** Same wrap as the server's circular difference: the shorter way round, in (−180°, 180°]. */
export function wrapDeg(d: number): number {
  const w = ((((d + 180) % 360) + 360) % 360) - 180;
  return w === -180 ? 180 : w;
}

const EXCLUSION_WORDS: Record<string, string> = {
  "few-strides": "too few strides",
  "weak-coupling": "coupling too weak",
  "no-coupling-strength": "no R",
};

/**
 * The MDC verdict of the latest session as the server flagged it. Without a flag the reason is
 * read from the same fields the server used (baseline session, excluded point, no baseline, no
 * MDC, no agreed direction), so the summary never claims a comparison the server did not make.
 * The words are kept short so each row stays on one line; the card below gives the detail.
 */
export function changeVerdict(metric: TrendMetric, p: TrendPoint): ChangeVerdict {
  if (p.flag === "improved" || p.flag === "worsened" || p.flag === "changed") return { kind: p.flag };
  if (p.flag === "within-error") return { kind: "within" };
  if (p.excludedReason) return { kind: "not-compared", reason: EXCLUSION_WORDS[p.excludedReason] ?? p.excludedReason.replace(/-/g, " ") };
  if (p.baseline) return { kind: "not-compared", reason: "baseline session" };
  if (metric.baseline === null) return { kind: "not-compared", reason: "no baseline yet" };
  if (!metric.mdc) return { kind: "not-compared", reason: "no MDC" };
  if (metric.direction === null && !isPhaseKey(metric.key)) return { kind: "not-compared", reason: "no agreed direction" };
  return { kind: "not-compared", reason: "not flagged" };
}

export function bandVerdicts(value: number, bands: TrendBand[]): BandVerdict[] {
  return bands.map((band, i) => ({ number: i + 1, band, position: value < band.low ? "below" : value > band.high ? "above" : "inside" }));
}

function row(metric: TrendMetric, cardBands: TrendBand[], couplingR: (sessionId: string) => number | null): SummaryRow {
  const latest = latestPoint(metric);
  const phase = isPhaseKey(metric.key);
  const mean = metric.baseline?.mean;
  const compared = latest !== null && !latest.excludedReason && !latest.baseline && typeof mean === "number";
  const delta = compared ? (phase ? wrapDeg(latest.value - mean) : latest.value - mean) : null;
  const own = metric.bands ?? [];
  // Number the metric's bands as the card does, so "band 2" here is "Band 2" under the chart.
  const bands =
    latest === null
      ? []
      : bandVerdicts(latest.value, cardBands).filter((v) => own.some((b) => b.label === v.band.label && b.low === v.band.low));
  const baselineAids = metric.points.filter((p) => p.baseline).map((p) => p.walkingAid);
  const aidDiffers =
    latest !== null && !latest.baseline && latest.walkingAid !== undefined && baselineAids.length > 0 && baselineAids.every((a) => a !== undefined) && baselineAids.some((a) => a !== latest.walkingAid);
  return {
    metric,
    label: metricDefinition(metric.key)?.label ?? metric.key,
    latest,
    phase,
    couplingR: phase && latest ? couplingR(latest.sessionId) : null,
    delta,
    change: latest ? changeVerdict(metric, latest) : { kind: "not-compared", reason: "no values yet" },
    bands,
    aidDiffers,
  };
}

/**
 * One row per metric drawn on the page, grouped and ordered like the cards. Mean relative phase
 * has no card of its own; each pair's phase follows that pair's coupling strength R, and only
 * when the page draws coupling strength at all (a phase is never shown without its R).
 */
export function summaryGroups(metrics: TrendMetric[]): SummaryGroup[] {
  const phases = metrics.filter((m) => isPhaseKey(m.key));
  const couplings = metrics.filter((m) => chartOf(m.key) === "armLegCoupling");
  const rOf = (pair: string | null) => (sessionId: string) => {
    const c = couplings.find((m) => pairOf(m.key) === pair);
    const p = c?.points.find((x) => x.sessionId === sessionId);
    return p && Number.isFinite(p.value) ? p.value : null;
  };
  return METRIC_CHARTS.map((family) => {
    const own = metrics.filter((m) => chartOf(m.key) === family.id);
    const cardBands = familyBands(own);
    const rows: SummaryRow[] = [];
    for (const m of own) {
      rows.push(row(m, cardBands, () => null));
      if (family.id === "armLegCoupling") for (const ph of phases.filter((x) => pairOf(x.key) === pairOf(m.key))) rows.push(row(ph, [], rOf(pairOf(ph.key))));
    }
    return { family, rows };
  }).filter((g) => g.rows.length > 0);
}
