import { AxisBottom } from "@visx/axis";
import { Group } from "@visx/group";
import { scaleBand, scaleTime } from "@visx/scale";
import { Bar, Line } from "@visx/shape";
import { patientText, type Assignment } from "../api/devices";
import { placementLabel } from "@/lib/placement-labels";

const WIDTH = 880;
const LANE = 44;
const MARGIN = { top: 22, right: 72, bottom: 36, left: 200 };
const HOUR_MS = 3_600_000;

// Each placement gets a fill and its own pattern of dashes on the outline, and every bar carries
// its placement in words, so the chart never depends on telling the colours apart.
const FILLS: Record<string, string> = {
  left_shank: "var(--color-moss)",
  right_shank: "var(--color-sky)",
  left_wrist: "var(--color-clay)",
  right_wrist: "var(--color-ochre)",
  left_foot: "var(--color-moss-deep)",
  right_foot: "var(--color-sky-deep)",
  lower_back: "var(--color-clay-deep)",
};

export interface TimelineLane {
  key: string;
  label: string;
  patient: string;
  placement: string;
}

export function laneOf(a: Assignment): TimelineLane {
  const patient = patientText(a);
  const placement = placementLabel(a.placement);
  return { key: `${a.patientId}|${a.placement}`, label: `${patient} · ${placement}`, patient, placement };
}

// Long names would run off the left edge of the chart; the table below always has the full name.
function clip(text: string, max: number): string {
  return text.length > max ? `${text.slice(0, max - 1)}…` : text;
}

/** A device's assignments over time, one lane per patient × placement; open assignments run to now. */
export function AssignmentTimeline({ assignments, now = new Date() }: { assignments: Assignment[]; now?: Date }) {
  if (assignments.length === 0) return null;
  const lanes: TimelineLane[] = [];
  for (const a of assignments) {
    const lane = laneOf(a);
    if (!lanes.some((l) => l.key === lane.key)) lanes.push(lane);
  }
  const starts = assignments.map((a) => new Date(a.from).getTime());
  const ends = assignments.map((a) => (a.to ? new Date(a.to).getTime() : now.getTime()));
  const min = Math.min(...starts);
  const max = Math.max(...ends, now.getTime());
  // A little room either side; at least an hour so a freshly made assignment is still visible.
  const pad = Math.max((max - min) * 0.05, HOUR_MS);
  const height = MARGIN.top + MARGIN.bottom + lanes.length * LANE;
  const innerWidth = WIDTH - MARGIN.left - MARGIN.right;
  const x = scaleTime({ domain: [new Date(min - pad), new Date(max + pad)], range: [0, innerWidth] });
  const y = scaleBand({ domain: lanes.map((l) => l.key), range: [0, lanes.length * LANE], padding: 0.25 });
  const summary = assignments
    .map((a) => `${laneOf(a).label} from ${a.from.slice(0, 10)} ${a.to ? `to ${a.to.slice(0, 10)}` : "until now"}`)
    .join("; ");

  return (
    <figure className="card overflow-x-auto p-4">
      <svg
        viewBox={`0 0 ${WIDTH} ${height}`}
        width="100%"
        role="img"
        aria-label={`Assignment timeline: ${summary}`}
        className="min-w-[640px] font-sans"
      >
        <Group left={MARGIN.left} top={MARGIN.top}>
          {lanes.map((lane) => (
            <text key={lane.key} x={-12} y={(y(lane.key) ?? 0) + y.bandwidth() / 2} textAnchor="end" fill="var(--color-ink)">
              <tspan x={-12} dy="-0.25em" fontSize={12} fontWeight={700}>
                {clip(lane.patient, 26)}
              </tspan>
              <tspan x={-12} dy="1.2em" fontSize={11} fill="var(--color-ink-soft)">
                {lane.placement}
              </tspan>
            </text>
          ))}
          {assignments.map((a) => {
            const x0 = x(new Date(a.from));
            const x1 = x(a.to ? new Date(a.to) : now);
            const top = y(laneOf(a).key) ?? 0;
            const width = Math.max(x1 - x0, 3);
            const open = a.to === null;
            return (
              <g key={a.id}>
                <title>{`${laneOf(a).label}: ${a.from.slice(0, 16).replace("T", " ")} to ${a.to ? a.to.slice(0, 16).replace("T", " ") : "now (ongoing)"} UTC`}</title>
                <Bar
                  x={x0}
                  y={top}
                  width={width}
                  height={y.bandwidth()}
                  rx={4}
                  fill={FILLS[a.placement] ?? "var(--color-ink-soft)"}
                  fillOpacity={open ? 0.95 : 0.55}
                  stroke="var(--color-ink)"
                  strokeWidth={1}
                  strokeDasharray={open ? undefined : "4 3"}
                />
                {open ? (
                  <text x={x1 + 6} y={top + y.bandwidth() / 2} dy="0.35em" fontSize={11} fill="var(--color-ink)" fontWeight={700}>
                    ▶ ongoing
                  </text>
                ) : null}
              </g>
            );
          })}
          <Line
            from={{ x: x(now), y: -4 }}
            to={{ x: x(now), y: lanes.length * LANE }}
            stroke="var(--color-ink)"
            strokeDasharray="2 3"
          />
          <text x={x(now)} y={-8} fontSize={10} textAnchor="middle" fill="var(--color-ink-soft)">
            now
          </text>
          <AxisBottom
            top={lanes.length * LANE}
            scale={x}
            numTicks={6}
            stroke="var(--color-line)"
            tickStroke="var(--color-line)"
            tickLabelProps={{ fontSize: 11, fill: "var(--color-ink-soft)", fontFamily: "inherit", textAnchor: "middle" }}
          />
        </Group>
      </svg>
      <figcaption className="mt-2 text-xs text-ink-soft">
        Solid bars are running assignments (marked "ongoing"); dashed outlines have ended. The table below lists the same
        periods.
      </figcaption>
    </figure>
  );
}
