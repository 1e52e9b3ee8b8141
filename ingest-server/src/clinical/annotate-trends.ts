/** The one entry point the trends route calls: flags, baselines, MDC, bands and events per metric. */
import { flagMetricChanges, type ChangeOptions, type FlaggedPoint, type SlopeFlag } from "./change-flags";
import { detectCoordinationEvents, type CoordinationEvent } from "./coordination-events";
import { CLINICAL_CAUTIONS } from "./cautions";
import { bandNote, bandsFor, type BandPopulation } from "./reference-bands";
import { gatePhaseSeries } from "./phase-gate";
import { gateFewStrides } from "./few-strides";
import { importantChangeFor, type Baseline, type ImportantChange, type Mdc } from "./reliability";
import { metricDefinition, type MetricDirection } from "../contracts/metric-catalog";

export interface TrendPointInput {
  sessionId: string;
  recordedAt: string;
  value: number;
  /** Strides (or steps, arm cycles) behind the value; variability values with too few are not compared. */
  n?: number | null;
}

export interface AnnotateTrendsInput {
  metrics: { key: string; unit: string; points: TrendPointInput[] }[];
  patient: { birthYear: number; condition: string; enrolledOn: string };
  options?: ChangeOptions & {
    confirmSessions?: number;
    /**
     * Show only points and events in [visibleFrom, visibleTo] (ISO instants). Baselines, MDC and
     * events are still computed from the whole series, so a date filter in the UI never moves the
     * baseline. Pass every stored session and filter here rather than in the query.
     */
    visibleFrom?: string;
    visibleTo?: string;
  };
}

/** A band as the API shows it: the values, who it describes and where it comes from. */
export interface BandOut {
  id: string;
  low: number;
  high: number;
  label: string;
  /** Authors, journal and the table/figure/abstract location, in one line. */
  citation: string;
  population: BandPopulation;
  walkingCondition: string;
  measurementSystem: string;
  publishedValue: string;
  derivation: string;
  location: string;
  note?: string;
}

export interface AnnotatedMetric {
  key: string;
  unit: string;
  /** Each point; speed-dependent metrics (PCI, stride-time CV) carry the session's `walkingSpeedMPerS` to read beside the value. */
  points: (FlaggedPoint & { walkingSpeedMPerS?: number })[];
  /** Why speed is shown beside this metric, with its source; absent for metrics that do not depend on speed. */
  speedNote?: string;
  baseline: Baseline | null;
  mdc: Mdc | null;
  slopeFlag: SlopeFlag | null;
  direction: MetricDirection;
  bands: BandOut[];
  /** Why no band is shown ("No published band for this patient…"); null when bands are shown. */
  bandNote: string | null;
  /** A published clinically important change for this condition, for interpretation beside the MDC; not used for flags. */
  importantChange: ImportantChange | null;
}

export interface AnnotatedTrends {
  metrics: AnnotatedMetric[];
  events: CoordinationEvent[];
  cautions: string[];
}

/** Age in whole years at the latest session (birth year only, so it may be one year high). */
function ageAt(birthYear: number, metrics: AnnotateTrendsInput["metrics"]): number | null {
  let latest = Number.NEGATIVE_INFINITY;
  for (const m of metrics) for (const p of m.points) latest = Math.max(latest, Date.parse(p.recordedAt));
  const year = Number.isFinite(latest) ? new Date(latest).getUTCFullYear() : new Date().getUTCFullYear();
  return Number.isInteger(birthYear) ? year - birthYear : null;
}

function visibility(from?: string, to?: string): (recordedAt: string) => boolean {
  const lo = from === undefined ? Number.NEGATIVE_INFINITY : Date.parse(from);
  const hi = to === undefined ? Number.POSITIVE_INFINITY : Date.parse(to);
  if (Number.isNaN(lo) || Number.isNaN(hi)) throw new RangeError("visibleFrom/visibleTo must be ISO dates");
  return (recordedAt) => {
    const t = Date.parse(recordedAt);
    return t >= lo && t <= hi;
  };
}

export function annotateTrends(input: AnnotateTrendsInput): AnnotatedTrends {
  const { patient, options = {} } = input;
  const visible = visibility(options.visibleFrom, options.visibleTo);
  const age = ageAt(patient.birthYear, input.metrics);
  // A mean relative phase is compared only where its session's coupling strength shows a real phase relation.
  // Variability from too few strides is shown but not compared (few-strides.ts).
  const gated = gateFewStrides(gatePhaseSeries(input.metrics));
  const speedSeries = input.metrics.find((m) => metricDefinition(m.key)?.base === "walkingSpeedMPerS");
  const speedBySession = new Map(speedSeries?.points.map((p) => [p.sessionId, p.value]) ?? []);
  const metrics = gated.map((m): AnnotatedMetric => {
    const change = flagMetricChanges(m.key, m.points, patient.condition, options);
    const speedDependent = metricDefinition(m.key)?.speedDependent;
    const withSpeed = (p: FlaggedPoint) => {
      const speed = speedBySession.get(p.sessionId);
      return speedDependent && speed !== undefined && Number.isFinite(speed) ? { ...p, walkingSpeedMPerS: speed } : p;
    };
    return {
      key: m.key,
      unit: m.unit,
      ...change,
      points: change.points.filter((p) => visible(p.recordedAt)).map(withSpeed),
      ...(speedDependent ? { speedNote: `Read beside walking speed: ${speedDependent.citation}.` } : {}),
      bands: bandsFor(m.key, { age, condition: patient.condition }).map(({ metric: _metric, ...band }) => ({
        ...band,
        citation: `${band.citation}, ${band.location}`,
      })),
      bandNote: bandNote(m.key, { age, condition: patient.condition }),
      importantChange: importantChangeFor(m.key, patient.condition),
    };
  });
  const events = detectCoordinationEvents(gated, {
    baselineSessions: options.baselineSessions,
    confirmSessions: options.confirmSessions,
    condition: patient.condition,
  });
  return { metrics, events: events.filter((e) => visible(e.recordedAt)), cautions: [...CLINICAL_CAUTIONS] };
}
