import { AxisBottom, AxisLeft } from "@visx/axis";
import { GridRows } from "@visx/grid";
import { Group } from "@visx/group";
import { ParentSize } from "@visx/responsive";
import { scaleLinear, scaleTime } from "@visx/scale";
import { LinePath } from "@visx/shape";
import type { ReactNode } from "react";
import { formatDate, formatNumber } from "@/lib/format";

export type PointFlag = "improved" | "worsened" | "within-error";

export interface SeriesPoint {
  key: string;
  t: Date;
  v: number;
  flag?: PointFlag;
  /** Extra words for the point's tooltip (e.g. "n = 42 strides; walking aid: cane"). */
  note?: string;
}

export interface ChartSeries {
  id: string;
  label: string;
  points: SeriesPoint[];
  /** A design-token colour (CSS variable) so print and screen share one palette. */
  color: string;
  dashed?: boolean;
}

export interface ChartBand {
  low: number;
  high: number;
  label: string;
}

export interface ChartMarker {
  t: Date;
  /** One letter drawn at the top of the marker line (shape + letter, not colour alone). */
  glyph: string;
  label: string;
}

export interface TimeSeriesChartProps {
  /** Read by screen readers; the visible title lives outside the chart. */
  ariaLabel: string;
  series: ChartSeries[];
  bands?: ChartBand[];
  markers?: ChartMarker[];
  /** Share one domain across charts so they line up on the same time axis. */
  xDomain?: [Date, Date];
  yLabel?: string;
  formatY?: (v: number) => string;
  height?: number;
  onPointClick?: (p: SeriesPoint) => void;
}

const MARGIN = { top: 18, right: 16, bottom: 34, left: 52 };

function extent(values: number[]): [number, number] {
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of values) {
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  if (!Number.isFinite(lo)) return [0, 1];
  if (lo === hi) return [lo - 1, hi + 1];
  const pad = (hi - lo) * 0.12;
  return [lo - pad, hi + pad];
}

/** Flag shapes: ▲ improved, ▼ worsened, ◆ within error — read without colour. */
export function FlagGlyph({ flag, x, y, color }: { flag: PointFlag | undefined; x: number; y: number; color: string }) {
  if (flag === "improved") return <path d={`M${x},${y - 6} L${x + 5.5},${y + 4} L${x - 5.5},${y + 4} Z`} fill="var(--color-moss)" stroke="white" strokeWidth={1} />;
  if (flag === "worsened") return <path d={`M${x},${y + 6} L${x + 5.5},${y - 4} L${x - 5.5},${y - 4} Z`} fill="var(--color-clay-deep)" stroke="white" strokeWidth={1} />;
  if (flag === "within-error") return <path d={`M${x},${y - 4.5} L${x + 4.5},${y} L${x},${y + 4.5} L${x - 4.5},${y} Z`} fill="var(--color-paper)" stroke={color} strokeWidth={1.5} />;
  return <circle cx={x} cy={y} r={3.2} fill={color} stroke="white" strokeWidth={1} />;
}

function Chart({ width, height, ariaLabel, series, bands = [], markers = [], xDomain, yLabel, formatY, onPointClick }: TimeSeriesChartProps & { width: number; height: number }): ReactNode {
  const innerW = Math.max(10, width - MARGIN.left - MARGIN.right);
  const innerH = Math.max(10, height - MARGIN.top - MARGIN.bottom);
  const all = series.flatMap((s) => s.points);
  const times = all.map((p) => p.t.getTime()).concat(markers.map((m) => m.t.getTime()));
  // Without a shared domain, pad 3 % each side so the first and last points are not cut by the edge.
  const rawLo = Math.min(...times);
  const rawHi = Math.max(...times);
  const pad = (rawHi - rawLo) * 0.03;
  const tLo = xDomain ? xDomain[0].getTime() : rawLo - pad;
  const tHi = xDomain ? xDomain[1].getTime() : rawHi + pad;
  const x = scaleTime({ domain: [new Date(tLo), new Date(tHi === tLo ? tLo + 86_400_000 : tHi)], range: [0, innerW] });
  const y = scaleLinear({ domain: extent(all.map((p) => p.v).concat(bands.flatMap((b) => [b.low, b.high]))), range: [innerH, 0], nice: true });
  // The metric's own display precision can be too coarse for a narrow range (0.7–0.8 m read as
  // "0.7, 0.7, 0.8, 0.8"); then the axis uses as many decimals as its tick step needs.
  const yTicks = y.ticks(4);
  const yTickStep = yTicks.length > 1 ? Math.abs(yTicks[1]! - yTicks[0]!) : 0;
  const yTickDecimals = yTickStep > 0 ? Math.max(0, Math.ceil(-Math.log10(yTickStep) - 1e-9)) : 0;
  const metricLabels = formatY ? yTicks.map((v) => formatY(v)) : null;
  const formatTick = (v: number) => (metricLabels && new Set(metricLabels).size === yTicks.length ? formatY!(v) : v.toFixed(yTickDecimals));

  return (
    <svg width={width} height={height} role="img" aria-label={ariaLabel}>
      <Group left={MARGIN.left} top={MARGIN.top}>
        <GridRows scale={y} width={innerW} stroke="var(--color-line)" strokeOpacity={0.7} numTicks={4} />
        {bands.map((b, i) => (
          <g key={`${b.label}-${i}`}>
            <rect
              x={0}
              width={innerW}
              y={y(b.high)}
              height={Math.max(1, y(b.low) - y(b.high))}
              fill="var(--color-sky)"
              fillOpacity={0.1 + 0.04 * i}
              stroke="var(--color-sky)"
              strokeOpacity={0.45}
              strokeDasharray="4 3"
            >
              <title>{b.label}</title>
            </rect>
            {/* Bands often share an edge: labels step left so they never sit on top of each other. */}
            <text x={innerW - 4 - i * 46} y={y(b.high) + 11} textAnchor="end" fontSize={10} fill="var(--color-sky-deep)">
              band {i + 1}
            </text>
          </g>
        ))}
        {markers.map((m, i) => (
          <g key={`${m.label}-${i}`} transform={`translate(${x(m.t)},0)`}>
            <line y1={0} y2={innerH} stroke="var(--color-ink-faint)" strokeDasharray="2 3" />
            <text y={-5} textAnchor="middle" fontSize={10} fontWeight={700} fill="var(--color-ink-soft)">
              {m.glyph}
            </text>
            <title>{m.label}</title>
          </g>
        ))}
        {series.map((s) => (
          <g key={s.id}>
            <LinePath data={s.points} x={(p) => x(p.t)} y={(p) => y(p.v)} stroke={s.color} strokeWidth={2} strokeDasharray={s.dashed ? "5 4" : undefined} />
            {s.points.map((p) => (
              <g
                key={p.key}
                onClick={onPointClick ? () => onPointClick(p) : undefined}
                style={onPointClick ? { cursor: "pointer" } : undefined}
                data-flag={p.flag ?? "none"}
              >
                <FlagGlyph flag={p.flag} x={x(p.t)} y={y(p.v)} color={s.color} />
                <title>{`${s.label}: ${formatY ? formatY(p.v) : formatNumber(p.v, 1)} on ${formatDate(p.t)}${p.flag ? ` (${p.flag.replace("-", " ")})` : ""}${p.note ? `; ${p.note}` : ""}`}</title>
              </g>
            ))}
          </g>
        ))}
        <AxisLeft
          scale={y}
          numTicks={4}
          stroke="var(--color-line)"
          tickStroke="var(--color-line)"
          tickFormat={(v) => formatTick(Number(v))}
          tickLabelProps={{ fill: "var(--color-ink-soft)", fontSize: 11, textAnchor: "end", dx: -4, dy: 3 }}
          label={yLabel}
          labelProps={{ fill: "var(--color-ink-soft)", fontSize: 11, textAnchor: "middle" }}
          labelOffset={32}
        />
        <AxisBottom
          top={innerH}
          scale={x}
          numTicks={Math.max(2, Math.min(6, Math.floor(innerW / 90)))}
          stroke="var(--color-line)"
          tickStroke="var(--color-line)"
          tickFormat={(d) => (d as Date).toLocaleDateString(undefined, { day: "numeric", month: "short" })}
          tickLabelProps={{ fill: "var(--color-ink-soft)", fontSize: 11, textAnchor: "middle" }}
        />
      </Group>
    </svg>
  );
}


/** A responsive time-series chart; the wrapper has an explicit height because ParentSize needs one. */
export function TimeSeriesChart(props: TimeSeriesChartProps) {
  const height = props.height ?? 220;
  return (
    <div style={{ height }} className="w-full">
      <ParentSize debounceTime={50}>{({ width }) => (width > 0 ? <Chart {...props} width={width} height={height} /> : null)}</ParentSize>
    </div>
  );
}

/** Fixed-width render for tests and print, where measuring the parent is not possible. */
export function TimeSeriesChartFixed(props: TimeSeriesChartProps & { width: number }) {
  return <Chart {...props} height={props.height ?? 220} />;
}
