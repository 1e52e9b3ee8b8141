import type { ChartMarker } from "@/components/charts/time-series-chart";
import { walkingAidLabel } from "@/lib/walking-aid";
import type { PatientSession } from "../api/trends";
import { formatDate } from "@/lib/format";


export interface AidRun {
  aid: string | null;
  from: string;
  to: string;
  sessions: number;
}

/** Consecutive processed sessions with the same recorded walking aid, oldest first. */
export function walkingAidRuns(sessions: PatientSession[]): AidRun[] {
  const done = sessions.filter((s) => s.status === "done").sort((a, b) => a.recordedAt.localeCompare(b.recordedAt));
  const runs: AidRun[] = [];
  for (const s of done) {
    const aid = s.walkingAid ?? null;
    const last = runs.at(-1);
    if (last && last.aid === aid) {
      last.to = s.recordedAt;
      last.sessions += 1;
    } else runs.push({ aid, from: s.recordedAt, to: s.recordedAt, sessions: 1 });
  }
  return runs;
}

/** A marker (letter A) on every chart where the recorded aid changed, so a step in a trend can be read against it. */
export function walkingAidMarkers(runs: AidRun[]): ChartMarker[] {
  return runs.slice(1).map((r, i) => ({
    t: new Date(r.from),
    glyph: "A",
    label: `Walking aid: ${walkingAidLabel(runs[i]!.aid)} → ${walkingAidLabel(r.aid)}`,
  }));
}

/** The walking aid under the charts: one entry per run of sessions with the same aid. */
export function WalkingAidStrip({ runs }: { runs: AidRun[] }) {
  if (runs.length === 0 || runs.every((r) => r.aid === null)) {
    return <p className="text-sm text-ink-soft">No walking aid has been recorded for these sessions. Record it on each session's page.</p>;
  }
  return (
    <ol className="flex flex-wrap gap-2 text-sm" aria-label="Walking aid by session">
      {runs.map((r) => (
        <li key={r.from} className="rounded-lg border border-line bg-paper px-2.5 py-1">
          <span className="font-semibold">{walkingAidLabel(r.aid)}</span>{" "}
          <span className="text-ink-soft">
            {r.sessions === 1 ? `1 session, ${formatDate(r.from)}` : `${r.sessions} sessions, ${formatDate(r.from)} – ${formatDate(r.to)}`}
          </span>
        </li>
      ))}
    </ol>
  );
}
