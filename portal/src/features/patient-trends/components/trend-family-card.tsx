import { IconAlert } from "@/components/icons";
import { TimeSeriesChart, type ChartMarker, type ChartSeries, type PointFlag } from "@/components/charts/time-series-chart";
import type { CoordinationEvent, TrendBand, TrendMetric } from "../api/trends";
import { metricDefinition, type MetricChart } from "@pendula/ingest-server/contracts";
import { FlagBadge } from "./flag-badge";
import { familyBands, trendCardId } from "./trend-summary-model";
import { walkingAidLabel } from "@/lib/walking-aid";
import { formatDate } from "@/lib/format";

const PALETTE = ["var(--color-moss)", "var(--color-clay-deep)", "var(--color-sky-deep)", "var(--color-ochre)"];
const seriesColor = (i: number) => PALETTE[i % PALETTE.length]!;
/** The catalogue's name for a trend key; the key itself only for a key the catalogue does not list. */
const labelOf = (key: string) => metricDefinition(key)?.label ?? key;

const asFlag = (f: string | undefined): PointFlag | undefined => (f === "improved" || f === "worsened" || f === "within-error" ? f : undefined);

export const displayUnit = (rawUnit: string) => (rawUnit === "/min" ? "steps/min" : rawUnit === "deg" ? "°" : rawUnit);

export function fmt(v: number, rawUnit: string) {
  const unit = displayUnit(rawUnit);
  const digits = Math.abs(v) >= 20 ? 1 : 2;
  if (unit === "°") return `${v.toFixed(digits)}°`;
  return `${v.toFixed(digits)}${unit && unit !== "1" ? ` ${unit}` : ""}`;
}

/** "n = 36 strides" for one trend point, or null when the server sent no count. */
export function countWords(n: number | null | undefined, noun: string | undefined): string | null {
  return typeof n === "number" ? `n = ${n} ${noun ?? "strides"}` : null;
}

export interface TrendFamilyCardProps {
  family: MetricChart;
  metrics: TrendMetric[];
  events: CoordinationEvent[];
  markers: ChartMarker[];
  xDomain: [Date, Date];
  cautions: string[];
  onOpenSession: (sessionId: string) => void;
}

export function TrendFamilyCard({ family, metrics, events, markers, xDomain, cautions, onOpenSession }: TrendFamilyCardProps) {
  const rawUnit = metrics[0]?.unit ?? "";
  const unit = displayUnit(rawUnit);
  const series: ChartSeries[] = metrics.map((m, i) => ({
    id: m.key,
    label: labelOf(m.key),
    color: seriesColor(i),
    dashed: i % 2 === 1,
    points: m.points
      .map((p) => ({
        key: `${m.key}-${p.sessionId}`,
        t: new Date(p.recordedAt),
        v: p.value,
        flag: asFlag(p.flag),
        sessionId: p.sessionId,
        note: [countWords(p.n, m.countNoun), p.walkingAid !== undefined ? `walking aid: ${walkingAidLabel(p.walkingAid)}` : null].filter(Boolean).join("; ") || undefined,
      }))
      .sort((a, b) => a.t.getTime() - b.t.getTime()),
  }));
  // Bands are shown once even when several series (left/right) share them.
  const bands: TrendBand[] = familyBands(metrics);
  // Flags compare each session with the baseline, so a steady change flags every later session:
  // list the latest flagged session per metric and count the earlier ones.
  const flagged = metrics.flatMap((m) => {
    const hits = m.points.filter((p) => p.flag === "improved" || p.flag === "worsened").sort((a, b) => a.recordedAt.localeCompare(b.recordedAt));
    const last = hits[hits.length - 1];
    return last ? [{ metric: m, point: last, earlier: hits.length - 1 }] : [];
  });
  const slopes = metrics.filter((m) => m.slopeFlag && m.slopeFlag.flag !== "within-error");
  const eventMarkers: ChartMarker[] = events.map((e) => ({ t: new Date(e.recordedAt), glyph: "E", label: e.message }));
  const hasFlags = flagged.length > 0 || slopes.length > 0 || events.length > 0;
  const sessionOf = new Map(series.flatMap((s) => s.points.map((p) => [p.key, (p as { sessionId?: string }).sessionId ?? ""])));

  return (
    <section id={trendCardId(family.id)} aria-labelledby={`fam-${family.id}`} className="card scroll-mt-4 break-inside-avoid p-4 sm:p-5">
      <div className="mb-2 flex flex-wrap items-baseline justify-between gap-2">
        <h3 id={`fam-${family.id}`} className="text-base font-bold">
          {family.title} {unit && unit !== "1" ? <span className="font-normal text-ink-soft">({unit})</span> : null}
        </h3>
        <ul className="flex flex-wrap gap-3 text-xs text-ink-soft" aria-label="Series">
          {series.map((s) => (
            <li key={s.id} className="flex items-center gap-1.5">
              <svg width="22" height="8" aria-hidden="true">
                <line x1="0" x2="22" y1="4" y2="4" stroke={s.color} strokeWidth="2" strokeDasharray={s.dashed ? "5 4" : undefined} />
              </svg>
              {s.label}
            </li>
          ))}
        </ul>
      </div>
      <p className="mb-2 text-sm text-ink-soft">{family.description}</p>

      {series.every((s) => s.points.length === 0) ? (
        <p className="rounded-lg bg-sand p-4 text-sm text-ink-soft">No values yet for this measure.</p>
      ) : (
        <TimeSeriesChart
          ariaLabel={`${family.title} over time`}
          series={series}
          bands={bands.map((b) => ({ low: b.low, high: b.high, label: b.label }))}
          markers={[...markers, ...eventMarkers]}
          xDomain={xDomain}
          formatY={(v) => (Math.abs(v) >= 20 ? v.toFixed(0) : v.toFixed(1))}
          onPointClick={(p) => {
            const id = sessionOf.get(p.key);
            if (id) onOpenSession(id);
          }}
        />
      )}

      <ul className="mt-2 flex flex-col gap-0.5 text-sm" aria-label={`${family.title}, latest values`}>
        {metrics.map((m) => {
          const last = [...m.points].sort((a, b) => a.recordedAt.localeCompare(b.recordedAt)).at(-1);
          if (!last) return null;
          const n = countWords(last.n, m.countNoun);
          return (
            <li key={m.key}>
              <span className="font-semibold">{labelOf(m.key)}, latest:</span> <span className="tabular">{fmt(last.value, m.unit)}</span> on {formatDate(last.recordedAt)}
              {n ? <span className="text-ink-soft"> ({n})</span> : null}
            </li>
          );
        })}
      </ul>

      <div className="mt-3 grid gap-3 text-sm lg:grid-cols-2">
        <div>
          <h4 className="font-semibold">Reference bands</h4>
          {bands.length === 0 ? (
            <p className="text-ink-soft">{metrics.map((m) => m.bandNote).find(Boolean) ?? "No published band fits this measure; none is drawn."}</p>
          ) : (
            <ol className="mt-1 flex flex-col gap-1">
              {bands.map((b, i) => (
                <li key={`${b.label}-${i}`}>
                  <span className="font-semibold">Band {i + 1}:</span> {b.label} ({fmt(b.low, "")}–{fmt(b.high, unit)}).{" "}
                  {b.population ? <span>Who: {b.population.description}. </span> : null}
                  {b.walkingCondition || b.measurementSystem ? (
                    <span className="text-ink-soft">{[b.walkingCondition, b.measurementSystem].filter(Boolean).join("; ")}. </span>
                  ) : null}
                  <span className="text-ink-soft">Source: {b.citation ?? "not given"}</span>
                  {b.note ? <span className="text-ink-soft"> {b.note}</span> : null}
                </li>
              ))}
            </ol>
          )}
          {[...new Set(metrics.map((m) => m.speedNote).filter(Boolean))].map((note) => (
            <p key={note} className="mt-1 text-ink-soft">
              {note}
            </p>
          ))}
          {metrics.map((m) =>
            m.mdc ? (
              <p key={m.key} className="mt-1 text-ink-soft">
                MDC95 for {labelOf(m.key)}: {fmt(m.mdc.value, m.unit)} —{" "}
                {m.mdc.source === "published" ? `published (${m.mdc.citation ?? "source not given"})` : "from this patient's own first sessions (a rough estimate with few sessions)"}.
              </p>
            ) : null,
          )}
        </div>

        {hasFlags ? (
          <div>
            <h4 className="font-semibold">Flags and events</h4>
            <ul className="mt-1 flex flex-col gap-1.5">
              {flagged.map(({ metric, point, earlier }) => (
                <li key={`${metric.key}-${point.sessionId}`} className="flex flex-wrap items-center gap-2">
                  <FlagBadge flag={point.flag!} />
                  <button type="button" className="text-left text-sky-deep underline underline-offset-2" onClick={() => onOpenSession(point.sessionId)}>
                    {labelOf(metric.key)} {fmt(point.value, metric.unit)} on {formatDate(point.recordedAt)}
                  </button>
                  {earlier > 0 ? <span className="text-xs text-ink-soft">(and {earlier} earlier flagged {earlier === 1 ? "session" : "sessions"})</span> : null}
                </li>
              ))}
              {slopes.map((m) => (
                <li key={`slope-${m.key}`} className="flex flex-wrap items-center gap-2">
                  <FlagBadge flag={m.slopeFlag!.flag} prefix="Trend" />
                  <span>
                    {labelOf(m.key)}: {m.slopeFlag!.slopePerWeek >= 0 ? "+" : ""}
                    {fmt(m.slopeFlag!.slopePerWeek, m.unit)} per week
                    {m.slopeFlag!.windowWeeks ? ` over ${m.slopeFlag!.windowWeeks} weeks` : ""}
                  </span>
                </li>
              ))}
              {events.map((e, i) => (
                <li key={`ev-${i}`} className="flex items-start gap-2">
                  <span className="inline-flex items-center gap-1 rounded-full border border-sky/30 bg-sky-wash px-2 py-0.5 text-xs font-semibold text-sky-deep">
                    <span aria-hidden="true">E</span> Coordination event
                  </span>
                  <span>
                    {formatDate(e.recordedAt)}: {e.message}
                  </span>
                </li>
              ))}
            </ul>
            <div role="note" className="mt-2 flex gap-2 rounded-lg border border-ochre/30 bg-ochre-wash p-2.5 text-xs text-ink">
              <IconAlert className="mt-0.5 shrink-0 text-ochre" />
              <p>{cautions.join(" ")}</p>
            </div>
          </div>
        ) : null}
      </div>
    </section>
  );
}
