import type { Analysis, ArmLegCoupling } from "@pendula/signal";
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
            {!it.value.includes("—") && it.note ? <dd className="text-xs text-ochre">Note: {it.note}</dd> : null}
          </div>
        );
      })}
    </dl>
  );
}

/** Spatio-temporal measures of the steady strides, each with the count it rests on. */
export function MetricsGrid({ a, counts }: { a: Analysis; counts?: MetricCounts }) {
  const m = a.metrics;
  const c = (key: string) => countText(counts, key);
  const items: Item[] = [
    { label: "Walking speed", value: f(m.walkingSpeedMPerS, 2, " m/s"), counts: [c("walkingSpeedMPerS")], reason: m.walkingSpeedReason, note: m.walkingSpeedReason },
    { label: "Stride length", value: f(m.strideLengthM, 2, " m"), counts: [c("strideLengthM")], reason: m.walkingSpeedReason },
    { label: "Cadence", value: f(m.cadenceStepsPerMin, 1, " steps/min"), counts: [c("cadenceStepsPerMin")] },
    { label: "Stride time (mean)", value: f(m.strideTimeMeanS, 3, " s"), counts: [c("strideTimeMeanS")] },
    { label: "Stride-time CV", value: f(m.strideTimeCvPct, 2, " %"), counts: [c("strideTimeCvPct")] },
    {
      label: "Swing-time CV L / R",
      value: `${f(m.swingTimeCvPct?.left, 2, " %")} / ${f(m.swingTimeCvPct?.right, 2, " %")}`,
      counts: [c("swingTimeCvPctLeft"), c("swingTimeCvPctRight")],
    },
    { label: "Stance L / R", value: `${f(m.stancePct.left, 1, " %")} / ${f(m.stancePct.right, 1, " %")}`, counts: [c("stancePctLeft"), c("stancePctRight")] },
    { label: "Double support", value: f(m.doubleSupportPct, 1, " %"), counts: [c("doubleSupportPct")] },
    { label: "Step-time asymmetry", value: f(m.stepTimeAsymmetryPct, 1, " %"), counts: [c("stepTimeAsymmetryPct")] },
    { label: "Gait asymmetry (swing)", value: f(m.gaitAsymmetryPct, 1, " %"), counts: [c("gaitAsymmetryPct")] },
    { label: "PCI", value: f(m.phaseCoordinationIndexPct, 1, " %"), counts: [c("phaseCoordinationIndexPct")] },
    { label: "Steady strides", value: String(m.steadyStrideCount) },
  ];
  return <Grid items={items} label="Gait measures" />;
}

/** Sagittal arm swing per arm and its asymmetry; the analysis' reason when there is none. */
export function ArmSwingSummary({ a, counts }: { a: Analysis; counts?: MetricCounts }) {
  const s = a.metrics.armSwing;
  if (!s) return <p className="text-ink-soft">Arm swing was not measured: {a.metrics.armSwingReason ?? "no reason was given by the analysis"}.</p>;
  const items: Item[] = [
    { label: "Arm swing, left", value: f(s.left.amplitudeDeg, 1, "°"), counts: [countText(counts, "armSwingAmplitudeDegLeft")], reason: a.metrics.armSwingReason },
    { label: "Arm swing, right", value: f(s.right.amplitudeDeg, 1, "°"), counts: [countText(counts, "armSwingAmplitudeDegRight")], reason: a.metrics.armSwingReason },
    { label: "Arm swing asymmetry", value: f(s.asymmetryPct, 1, " %"), counts: [countText(counts, "armSwingAsymmetryPct")], reason: a.metrics.armSwingReason },
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
        <dt className="text-ink-soft">Frequency ratio</dt>
        <dd className="tabular">{ratio}</dd>
        <dt className="text-ink-soft">Coupling strength R</dt>
        <dd className="tabular">
          {f(c.couplingStrength, 2)}
        </dd>
        <dt className="text-ink-soft">Mean relative phase</dt>
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
