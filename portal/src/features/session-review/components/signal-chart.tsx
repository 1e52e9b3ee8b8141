import { AxisBottom, AxisLeft } from "@visx/axis";
import { Brush, type Bounds } from "@visx/brush";
import { GridRows } from "@visx/grid";
import { Group } from "@visx/group";
import { ParentSize } from "@visx/responsive";
import { scaleLinear } from "@visx/scale";
import { LinePath } from "@visx/shape";
import { useMemo, useState } from "react";

export interface Trace {
  id: string;
  label: string;
  color: string;
  timeS: number[];
  value: number[];
  /** Events drawn over this trace, seconds on the session time base. */
  initialContacts: number[];
  finalContacts: number[];
}

const M = { top: 24, right: 14, bottom: 30, left: 56 };
const OVERVIEW_H = 64;

function yExtent(traces: Trace[], from: number, to: number): [number, number] {
  let lo = Infinity;
  let hi = -Infinity;
  for (const t of traces) {
    for (let i = 0; i < t.timeS.length; i++) {
      const ts = t.timeS[i]!;
      if (ts < from || ts > to) continue;
      const v = t.value[i]!;
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
  }
  if (!Number.isFinite(lo)) return [-1, 1];
  const pad = (hi - lo) * 0.08 || 1;
  return [lo - pad, hi + pad];
}

/** Points inside [from, to] plus one either side, so lines reach the edges when zoomed. */
function windowed(t: Trace, from: number, to: number) {
  const out: { t: number; v: number }[] = [];
  for (let i = 0; i < t.timeS.length; i++) {
    const ts = t.timeS[i]!;
    const next = t.timeS[i + 1];
    const prev = t.timeS[i - 1];
    if ((ts >= from && ts <= to) || (next !== undefined && next >= from && ts < from) || (prev !== undefined && prev <= to && ts > to)) out.push({ t: ts, v: t.value[i]! });
  }
  return out;
}

function Inner({ width, traces, durationS, height }: { width: number; traces: Trace[]; durationS: number; height: number }) {
  const [range, setRange] = useState<[number, number]>([0, Math.min(durationS, 12)]);
  const innerW = Math.max(10, width - M.left - M.right);
  const innerH = height - M.top - M.bottom;
  const x = scaleLinear({ domain: range, range: [0, innerW] });
  const y = scaleLinear({ domain: yExtent(traces, range[0], range[1]), range: [innerH, 0], nice: true });
  const ox = useMemo(() => scaleLinear({ domain: [0, durationS], range: [0, innerW] }), [durationS, innerW]);
  const oy = useMemo(() => scaleLinear({ domain: yExtent(traces, 0, durationS), range: [OVERVIEW_H - 8, 0] }), [traces, durationS]);
  const inRange = (s: number) => s >= range[0] && s <= range[1];

  return (
    <div>
      <svg width={width} height={height} role="img" aria-label={`Sagittal angular velocity from ${range[0].toFixed(1)} s to ${range[1].toFixed(1)} s with initial and final contacts`}>
        <defs>
          <clipPath id="signal-clip">
            <rect width={innerW} height={innerH} />
          </clipPath>
        </defs>
        <Group left={M.left} top={M.top}>
          <GridRows scale={y} width={innerW} stroke="var(--color-line)" numTicks={5} />
          <g clipPath="url(#signal-clip)">
            {traces.map((t) => (
              <LinePath key={t.id} data={windowed(t, range[0], range[1])} x={(p) => x(p.t)} y={(p) => y(p.v)} stroke={t.color} strokeWidth={1.4} />
            ))}
            {traces.map((t) => (
              <g key={`ev-${t.id}`}>
                {t.initialContacts.filter(inRange).map((s) => (
                  <g key={`ic-${s}`} transform={`translate(${x(s)},0)`} data-event="IC">
                    <line y1={0} y2={innerH} stroke={t.color} strokeOpacity={0.55} strokeDasharray="3 2" />
                    <path d="M-4,0 L4,0 L0,7 Z" fill={t.color} />
                    <title>{`${t.label} initial contact at ${s.toFixed(2)} s`}</title>
                  </g>
                ))}
                {t.finalContacts.filter(inRange).map((s) => (
                  <g key={`fc-${s}`} transform={`translate(${x(s)},${innerH})`} data-event="FC">
                    <path d="M-4,0 L4,0 L0,-7 Z" fill="var(--color-paper)" stroke={t.color} strokeWidth={1.3} />
                    <title>{`${t.label} final contact at ${s.toFixed(2)} s`}</title>
                  </g>
                ))}
              </g>
            ))}
          </g>
          <AxisLeft
            scale={y}
            numTicks={5}
            stroke="var(--color-line)"
            tickStroke="var(--color-line)"
            label="deg/s"
            labelOffset={36}
            labelProps={{ fill: "var(--color-ink-soft)", fontSize: 11, textAnchor: "middle" }}
            tickLabelProps={{ fill: "var(--color-ink-soft)", fontSize: 11, textAnchor: "end", dx: -4, dy: 3 }}
          />
          <AxisBottom
            top={innerH}
            scale={x}
            numTicks={8}
            stroke="var(--color-line)"
            tickStroke="var(--color-line)"
            tickFormat={(v) => `${Number(v).toFixed(1)} s`}
            tickLabelProps={{ fill: "var(--color-ink-soft)", fontSize: 11, textAnchor: "middle" }}
          />
        </Group>
      </svg>
      <p className="no-print mt-1 text-xs text-ink-soft">Drag across the overview to zoom; drag the selection to move it. Keyboard: use the buttons.</p>
      <svg width={width} height={OVERVIEW_H} className="no-print" aria-label="Whole recording overview; drag to choose the part shown above">
        <Group left={M.left}>
          {traces.map((t) => (
            <LinePath key={t.id} data={windowed(t, 0, durationS).filter((_, i) => i % 4 === 0)} x={(p) => ox(p.t)} y={(p) => oy(p.v)} stroke={t.color} strokeOpacity={0.6} strokeWidth={1} />
          ))}
          <Brush
            xScale={ox}
            yScale={oy}
            width={innerW}
            height={OVERVIEW_H - 8}
            margin={{ left: M.left, top: 0 }}
            handleSize={8}
            resizeTriggerAreas={["left", "right"]}
            brushDirection="horizontal"
            initialBrushPosition={{ start: { x: ox(range[0]) }, end: { x: ox(range[1]) } }}
            onChange={(b: Bounds | null) => {
              if (b && b.x1 - b.x0 > 0.2) setRange([Math.max(0, b.x0), Math.min(durationS, b.x1)]);
            }}
            selectedBoxStyle={{ fill: "var(--color-sky)", fillOpacity: 0.15, stroke: "var(--color-sky-deep)" }}
            useWindowMoveEvents
          />
        </Group>
      </svg>
      <div className="no-print mt-2 flex flex-wrap gap-2 text-sm">
        <ZoomButton label="◀ Earlier" onClick={() => shift(-1)} />
        <ZoomButton label="Later ▶" onClick={() => shift(1)} />
        <ZoomButton label="Zoom in" onClick={() => zoom(0.5)} />
        <ZoomButton label="Zoom out" onClick={() => zoom(2)} />
        <ZoomButton label="Whole recording" onClick={() => setRange([0, durationS])} />
      </div>
    </div>
  );

  function shift(dir: number) {
    const w = range[1] - range[0];
    const from = Math.min(Math.max(0, range[0] + dir * w * 0.5), Math.max(0, durationS - w));
    setRange([from, from + w]);
  }
  function zoom(f: number) {
    const mid = (range[0] + range[1]) / 2;
    const w = Math.min(durationS, Math.max(1, (range[1] - range[0]) * f));
    const from = Math.min(Math.max(0, mid - w / 2), Math.max(0, durationS - w));
    setRange([from, from + w]);
  }
}

function ZoomButton({ label, onClick }: { label: string; onClick: () => void }) {
  return (
    <button type="button" onClick={onClick} className="rounded-md border border-line bg-paper px-2.5 py-1 font-semibold hover:bg-sand-deep">
      {label}
    </button>
  );
}

export function SignalChart({ traces, durationS, height = 300 }: { traces: Trace[]; durationS: number; height?: number }) {
  return (
    <div style={{ minHeight: height + OVERVIEW_H + 60 }} className="w-full">
      <div style={{ height: height + OVERVIEW_H + 60 }}>
        <ParentSize debounceTime={50}>{({ width }) => (width > 0 ? <Inner width={width} traces={traces} durationS={durationS} height={height} /> : null)}</ParentSize>
      </div>
    </div>
  );
}
