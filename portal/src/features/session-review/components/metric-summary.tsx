import type { Analysis, ArmLegCoupling } from "@pendula/signal";
import { BASE_METRIC_INFO, formatMetricValue, METRICS, metricDefinition, type MetricFamily, type MetricKey } from "@pendula/ingest-server/contracts";
import { formatNumber } from "@/lib/format";

export type MetricCounts = Record<string, { n: number; countNoun: string }>;

const f = formatNumber;

/** "n = 42 strides" for one stored metric, or null when the analysis gave no count. */
export function countText(counts: MetricCounts | undefined, key: string): string | null {
  const c = counts?.[key];
  return c ? `n = ${c.n} ${c.countNoun}` : null;
}

interface Item {
  label: string;
  value: string;
  /** The counts behind the value ("n = 42 strides"), each for one stored metric. */
  counts?: Array<string | null>;
  /** Why the value is missing, from the analysis. */
  reason?: string | null;
  /** The analysis' remark on a value it did compute (e.g. an assumption that makes it less certain). */
  note?: string | null;
}

function Grid({ items, label }: { items: Item[]; label: string }) {
  return (
    <dl className="grid gap-2 sm:grid-cols-3 lg:grid-cols-4" aria-label={label}>
      {items.map((it) => {
        const counts = (it.counts ?? []).filter((c): c is string => Boolean(c));
        return (
          <div key={it.label} className="rounded-lg border border-line bg-paper p-2.5">
            <dt className="text-xs text-ink-soft">{it.label}</dt>
            <dd className="tabular font-bold">{it.value}</dd>
            {counts.length ? <dd className="text-xs text-ink-soft">{[...new Set(counts)].join(" / ")}</dd> : null}
            {it.value.includes("—") && it.reason ? <dd className="text-xs text-ink-soft">{it.reason}</dd> : null}
            {!it.value.includes("—") && it.note ? (
              <dd className="text-xs text-ochre">
                <AnalysisNote note={it.note} />
              </dd>
            ) : null}
          </div>
        );
      })}
    </dl>
  );
}

/**
 * Beyond this many characters a note folds behind its summary line: the analysis explains an
 * assumption per sensor (both shanks give ≈ 400 characters), which otherwise towered over the
 * grid and pushed the other measures out of view. Common practice, not a published figure.
 */
const NOTE_INLINE_CHARS = 120;

function AnalysisNote({ note }: { note: string }) {
  if (note.length <= NOTE_INLINE_CHARS) return <>Note: {note}</>;
  return (
    <details>
      <summary className="cursor-pointer">Note from the analysis: this value rests on an assumption</summary>
      <p className="mt-1">{note}</p>
    </details>
  );
}

const entry = (key: MetricKey) => metricDefinition(key)!;
/** A value printed with its catalogue entry's decimals and unit. */
const value = (key: MetricKey, v: number | null | undefined) => formatMetricValue(entry(key), v);
/** One grid cell for one stored metric, named by the catalogue. */
const one = (key: MetricKey, v: number | null | undefined, counts?: MetricCounts, more: Partial<Item> = {}): Item => ({
  label: entry(key).shortLabel,
  value: value(key, v),
  counts: [countText(counts, key)],
  ...more,
});
/** One grid cell for a per-side metric: "Stance L / R" with both sides' values. */
const sides = (left: MetricKey, right: MetricKey, v: { left: number | null; right: number | null } | null | undefined, counts?: MetricCounts): Item => ({
  label: `${entry(left).name} L / R`,
  value: `${value(left, v?.left)} / ${value(right, v?.right)}`,
  counts: [countText(counts, left), countText(counts, right)],
});

/**
 * Metrics this grid places itself or leaves out on purpose: step time and swing % per side are read
 * stride by stride in the strides table, and DFA alpha needs more strides than a weekly walk
 * usually has (it stays in the research export).
 */
const PLACED = new Set<MetricKey>([
  "walkingSpeedMPerS",
  "strideLengthM",
  "cadenceStepsPerMin",
  "strideTimeMeanS",
  "strideTimeCvPct",
  "swingTimeCvPctLeft",
  "swingTimeCvPctRight",
  "stancePctLeft",
  "stancePctRight",
  "doubleSupportPct",
  "stepTimeAsymmetryPct",
  "gaitAsymmetryPct",
  "phaseCoordinationIndexPct",
  "steadyStrideCount",
  "stepTimeMeanSLeft",
  "stepTimeMeanSRight",
  "swingPctLeft",
  "swingPctRight",
  "dfaAlpha",
]);
/** Shown in the arm swing summary and the coupling cards. */
const ARM_FAMILIES = new Set<MetricFamily>(["arm-swing", "arm-leg-coordination"]);

/** Spatio-temporal measures of the steady strides, each with the count it rests on. */
export function MetricsGrid({ a, counts }: { a: Analysis; counts?: MetricCounts }) {
  const m = a.metrics;
  const items: Item[] = [
    one("walkingSpeedMPerS", m.walkingSpeedMPerS, counts, { reason: m.walkingSpeedReason, note: m.walkingSpeedReason }),
    one("strideLengthM", m.strideLengthM, counts, { reason: m.walkingSpeedReason, note: m.walkingSpeedReason }),
    one("cadenceStepsPerMin", m.cadenceStepsPerMin, counts),
    one("strideTimeMeanS", m.strideTimeMeanS, counts),
    one("strideTimeCvPct", m.strideTimeCvPct, counts),
    sides("swingTimeCvPctLeft", "swingTimeCvPctRight", m.swingTimeCvPct, counts),
    sides("stancePctLeft", "stancePctRight", m.stancePct, counts),
    one("doubleSupportPct", m.doubleSupportPct, counts),
    one("stepTimeAsymmetryPct", m.stepTimeAsymmetryPct, counts),
    one("gaitAsymmetryPct", m.gaitAsymmetryPct, counts),
    one("phaseCoordinationIndexPct", m.phaseCoordinationIndexPct, counts),
    // The count of steady strides is itself the count; no "n =" under it.
    { label: entry("steadyStrideCount").shortLabel, value: value("steadyStrideCount", m.steadyStrideCount) },
    // Any other catalogue metric of the legs (a newly added one, say) follows, read by its own accessor.
    ...METRICS.filter((d) => !PLACED.has(d.key) && !ARM_FAMILIES.has(d.family)).map((d) => one(d.key, d.read(m), counts)),
  ];
  return <Grid items={items} label="Gait measures" />;
}

/** Sagittal arm swing per arm and its asymmetry; the analysis' reason when there is none. */
export function ArmSwingSummary({ a, counts }: { a: Analysis; counts?: MetricCounts }) {
  const s = a.metrics.armSwing;
  if (!s) return <p className="text-ink-soft">Arm swing was not measured: {a.metrics.armSwingReason ?? "no reason was given by the analysis"}.</p>;
  const reason = { reason: a.metrics.armSwingReason };
  const items: Item[] = [
    one("armSwingAmplitudeDegLeft", s.left.amplitudeDeg, counts, reason),
    one("armSwingAmplitudeDegRight", s.right.amplitudeDeg, counts, reason),
    one("armSwingAsymmetryPct", s.asymmetryPct, counts, reason),
  ];
  return <Grid items={items} label="Arm swing" />;
}

/**
 * One arm–leg pair. The mean relative phase is never shown without its coupling strength R beside
 * it: a phase means little when the arm and the leg are barely locked, so the analysis withholds it
 * (null, with a reason) when R is low, and this card says why instead.
 */
export function CouplingCard({ title, c }: { title: string; c: ArmLegCoupling }) {
  const hasPhase = typeof c.meanRelativePhaseDeg === "number" && typeof c.couplingStrength === "number";
  const ratio = c.frequencyRatio === 1 ? "1:1" : c.frequencyRatio === 2 ? "2:1" : f(c.frequencyRatio, 2, " arm cycles per stride");
  return (
    <div className="rounded-lg border border-line bg-paper p-3">
      <h4 className="font-semibold">{title}</h4>
      <dl className="mt-1 grid grid-cols-[auto_1fr] gap-x-3 gap-y-1 text-sm">
        <dt className="text-ink-soft">{BASE_METRIC_INFO.frequencyRatio.name}</dt>
        <dd className="tabular">{ratio}</dd>
        <dt className="text-ink-soft">{BASE_METRIC_INFO.couplingStrength.name}</dt>
        <dd className="tabular">
          {formatMetricValue(BASE_METRIC_INFO.couplingStrength, c.couplingStrength)}
        </dd>
        <dt className="text-ink-soft">{BASE_METRIC_INFO.meanRelativePhaseDeg.name}</dt>
        <dd className="tabular" data-testid="relative-phase">
          {hasPhase ? (
            `${c.meanRelativePhaseDeg!.toFixed(0)}° (R = ${c.couplingStrength!.toFixed(2)}${typeof c.circularSdDeg === "number" ? `, circular SD ${c.circularSdDeg.toFixed(0)}°` : ""})`
          ) : (
            <span className="text-ink-soft">not reported: {c.reason ?? "the coupling could not be computed"}</span>
          )}
        </dd>
      </dl>
    </div>
  );
}
