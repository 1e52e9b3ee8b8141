import type { ReactNode } from "react";
import { Link, useNavigate } from "react-router-dom";
import type { ChartMarker } from "@/components/charts/time-series-chart";
import { IconAlert, IconPrint } from "@/components/icons";
import { Badge, Button, EmptyState, PageHeader, Section, Table, Td, Th } from "@/components/ui";
import { formatMetricValue, METRIC_CHARTS, metricDefinition } from "@pendula/ingest-server/contracts";
import { usePatientDetail, usePatientSessions, useTrends, type CoordinationEvent, type TrendMetric } from "../api/trends";
import { DEFAULT_CAUTIONS, SHORT_CAUTION } from "./flag-badge";
import { TrendFamilyCard } from "./trend-family-card";
import { TrendSummary } from "./trend-summary";
import { PatientHeightForm } from "./patient-height-form";
import { WalkingAidStrip, walkingAidMarkers, walkingAidRuns } from "./walking-aid-strip";
import { walkingAidLabel } from "@/lib/walking-aid";
import { formatCalendarDay } from "@/lib/calendar-day";
import { conditionLabel } from "@/lib/condition-labels";
import { formatDateTime } from "@/lib/format";

/** The session list's metric columns: the values each session row carries, named and printed by the catalogue. */
const SESSION_COLUMNS = ["walkingSpeedMPerS", "cadenceStepsPerMin", "strideTimeCvPct", "phaseCoordinationIndexPct"] as const;

export interface PatientTrendsPageProps {
  patientId: string;
  /** Notes and training sessions, drawn on every chart at the same time positions. */
  markers?: ChartMarker[];
  /** The notes and training panel, supplied by the route (it belongs to the notes feature). */
  notesPanel?: ReactNode;
}

/** One shared time domain so every chart, the notes and the training log line up. */
export function sharedDomain(metrics: TrendMetric[], markers: ChartMarker[]): [Date, Date] | null {
  const ts = metrics.flatMap((m) => m.points.map((p) => Date.parse(p.recordedAt))).concat(markers.map((m) => m.t.getTime()));
  if (!ts.length) return null;
  const lo = Math.min(...ts);
  const hi = Math.max(...ts);
  const pad = Math.max(3 * 86_400_000, (hi - lo) * 0.03);
  return [new Date(lo - pad), new Date(hi + pad)];
}

export function PatientTrendsPage({ patientId, markers = [], notesPanel }: PatientTrendsPageProps) {
  const { data: patient } = usePatientDetail(patientId);
  const { data: trends } = useTrends(patientId);
  const { data: sessions } = usePatientSessions(patientId);
  const navigate = useNavigate();
  const openSession = (id: string) => navigate(`/clinician/sessions/${id}`);
  const events: CoordinationEvent[] = trends.events ?? [];
  // The full cautions appear once above the charts; each card repeats the short form beside its flags.
  const cautions = trends.cautions?.length ? trends.cautions : DEFAULT_CAUTIONS;
  const aidRuns = walkingAidRuns(sessions.items);
  const chartMarkers = [...markers, ...walkingAidMarkers(aidRuns)];
  const domain = sharedDomain(trends.metrics, chartMarkers);
  const chartOf = (key: string) => metricDefinition(key)?.chart ?? null;
  const byFamily = METRIC_CHARTS.map((f) => ({
    family: f,
    metrics: trends.metrics.filter((m) => chartOf(m.key) === f.id),
  })).filter((g) => g.metrics.length > 0);

  return (
    <div>
      <PageHeader
        eyebrow="Patient trends"
        title={patient.displayName}
        actions={
          <Button variant="secondary" icon={<IconPrint />} onClick={() => window.print()}>
            Print report
          </Button>
        }
      >
        {[patient.condition ? conditionLabel(patient.condition) : null, patient.conditionDetail, patient.enrolledOn ? `enrolled ${formatCalendarDay(patient.enrolledOn)}` : null, patient.researchId ? `research id ${patient.researchId}` : null]
          .filter(Boolean)
          .join(" · ")}
      </PageHeader>
      {/* First on screen: the page is long, so the latest state of every measure is readable before any chart. */}
      {byFamily.length > 0 && domain ? <TrendSummary metrics={trends.metrics} /> : null}
      <p className="print-only mb-2 text-sm">Height: {patient.heightCm != null ? `${patient.heightCm} cm` : "not entered"}.</p>
      <div className="card mb-6 p-4">
        <PatientHeightForm
          patientId={patientId}
          heightCm={patient.heightCm}
          processedSessionIds={sessions.items.filter((s) => s.status === "done").map((s) => s.id)}
        />
      </div>
      <p className="print-only mb-4 text-sm">Trend report printed {new Date().toLocaleString()}. Pendula supports clinical judgement; it does not diagnose.</p>

      <details className="no-print mb-6 rounded-lg border border-line bg-paper p-3 text-sm">
        <summary className="cursor-pointer font-semibold">How to read these charts</summary>
        <ul className="mt-2 grid gap-1 sm:grid-cols-2">
          <li>▲ filled: improved beyond MDC</li>
          <li>▼ filled: worsened beyond MDC</li>
          <li>◆ open: change within measurement error</li>
          <li>● small: no flag (baseline or not assessed)</li>
          <li>Shaded bands: published reference ranges, numbered and sourced under each chart</li>
          <li>Dotted lines — N: clinician note, T: training, E: coordination event, A: walking aid changed</li>
          <li>Hover a point for the number of strides behind it and the walking aid of that session</li>
        </ul>
        <p className="mt-2">Select a point, or a row in the session list, to open that session.</p>
      </details>

      {byFamily.length === 0 || !domain ? (
        <EmptyState title="No measured sessions yet">Trends appear after the first weekly walk has been processed.</EmptyState>
      ) : (
        <div className="mb-8 flex flex-col gap-5">
          <div role="note" className="card flex gap-2 border-ochre/40 bg-ochre-wash p-4 text-sm">
            <IconAlert className="mt-0.5 shrink-0 text-ochre" />
            <div className="flex flex-col gap-1">
              <p className="font-semibold">Reading flags and bands</p>
              {cautions.map((c) => (
                <p key={c}>{c}</p>
              ))}
            </div>
          </div>
          {byFamily.map(({ family, metrics }) => (
            <TrendFamilyCard
              key={family.id}
              family={family}
              metrics={metrics}
              events={events.filter((e) => e.metricKey && chartOf(e.metricKey) === family.id)}
              markers={chartMarkers}
              xDomain={domain}
              cautions={SHORT_CAUTION}
              onOpenSession={openSession}
            />
          ))}
          <section aria-labelledby="walking-aid-heading" className="card p-4 sm:p-5">
            <h3 id="walking-aid-heading" className="mb-2 text-base font-bold">
              Walking aid
            </h3>
            <WalkingAidStrip runs={aidRuns} />
          </section>
        </div>
      )}

      {notesPanel}

      <Section title="Sessions" id="sessions">
        {sessions.items.length === 0 ? (
          <EmptyState title="No sessions uploaded">The patient has not uploaded a walk yet.</EmptyState>
        ) : (
          <Table>
            <thead>
              <tr>
                <Th>Recorded</Th>
                <Th>Status</Th>
                {SESSION_COLUMNS.map((key) => (
                  <Th key={key}>{metricDefinition(key)!.shortLabel}</Th>
                ))}
                <Th>Walking aid</Th>
              </tr>
            </thead>
            <tbody>
              {[...sessions.items]
                .sort((a, b) => b.recordedAt.localeCompare(a.recordedAt))
                .map((s) => (
                  <tr key={s.id}>
                    <Td>
                      <Link to={`/clinician/sessions/${s.id}`} className="font-semibold text-sky-deep underline-offset-2 hover:underline">
                        {formatDateTime(s.recordedAt)}
                      </Link>
                    </Td>
                    <Td>
                      {s.status === "done" ? <Badge tone="good">Processed</Badge> : s.status === "failed" ? <Badge tone="alert">Failed</Badge> : <Badge tone="info">{s.status === "queued" ? "Queued" : "Processing"}</Badge>}
                    </Td>
                    {SESSION_COLUMNS.map((key) => (
                      <Td key={key} className="tabular">
                        {formatMetricValue(metricDefinition(key)!, s[key])}
                      </Td>
                    ))}
                    <Td>{walkingAidLabel(s.walkingAid)}</Td>
                  </tr>
                ))}
            </tbody>
          </Table>
        )}
      </Section>
    </div>
  );
}
