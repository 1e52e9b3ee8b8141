import { useState, type ReactNode } from "react";
import { Link } from "react-router-dom";
import type { Analysis } from "@pendula/signal";
import { IconPrint } from "@/components/icons";
import { Badge, Button, EmptyState, ErrorState, LoadingState, PageHeader, Section, Table, Td, Th } from "@/components/ui";
import { useQueries } from "@tanstack/react-query";
import { signalQueryOptions, useSession } from "../api/session";
import { SignalChart, type Trace } from "./signal-chart";
import { ArmSwingSummary, CouplingCard, MetricsGrid, type MetricCounts } from "./metric-summary";
import { qualityLabel } from "./quality-labels";
import { formatNumber } from "@/lib/format";
import { placementLabel } from "@/lib/placement-labels";
import { walkingAidLabel } from "@/lib/walking-aid";
import { WalkingAidEditor } from "./walking-aid-editor";

const TRACE_COLOR: Record<string, string> = {
  left_shank: "var(--color-moss)",
  right_shank: "var(--color-clay-deep)",
  left_foot: "var(--color-moss)",
  right_foot: "var(--color-clay-deep)",
  left_wrist: "var(--color-sky-deep)",
  right_wrist: "var(--color-ochre)",
  lower_back: "var(--color-ink-soft)",
};
const EXCLUDED_WORDS: Record<string, string> = {
  "bout-edge": "first/last of a bout",
  turn: "near a turn",
  "invalid-span": "crosses a gap",
  "out-of-range": "implausible duration",
  "event-order": "events out of order",
  gap: "crosses a data gap",
  unsteady: "not steady walking",
};

const f = formatNumber;

function SignalSection({ sessionId, analysis }: { sessionId: string; analysis: Analysis }) {
  const available = analysis.session.placements;
  const defaults = available.filter((p) => p.endsWith("_shank") || p.endsWith("_foot")).slice(0, 2);
  const [shown, setShown] = useState<string[]>(defaults.length ? defaults : available.slice(0, 1));
  const results = useQueries({ queries: available.map((p) => ({ ...signalQueryOptions(sessionId, p), enabled: shown.includes(p) })) });
  const queries = available.map((p, i) => ({ p, q: results[i]! }));
  const pending = queries.some(({ p, q }) => shown.includes(p) && q.isPending);
  const failed = queries.find(({ p, q }) => shown.includes(p) && q.isError);

  const traces: Trace[] = queries
    .filter(({ p, q }) => shown.includes(p) && q.data)
    .flatMap(({ p, q }) =>
      q.data!.traces.map((t) => {
        const side = p.startsWith("left") ? "left" : p.startsWith("right") ? "right" : null;
        const leg = p.endsWith("_shank") || p.endsWith("_foot");
        return {
          id: `${p}-${t.placement}`,
          label: placementLabel(t.placement),
          color: TRACE_COLOR[t.placement] ?? "var(--color-ink)",
          timeS: t.timeS,
          value: t.value,
          initialContacts: side && leg ? analysis.events[side].initialContacts : [],
          finalContacts: side && leg ? analysis.events[side].finalContacts : [],
        };
      }),
    );

  return (
    <Section
      title="Raw signal and detected events"
      id="signal"
      description="Sagittal angular velocity (deg/s) after orientation. ▼ filled at the top: initial contact (IC); ▽ open at the bottom: final contact (FC). Check a few strides by eye before relying on the numbers."
    >
      <fieldset className="no-print mb-3 flex flex-wrap gap-3 text-sm">
        <legend className="sr-only">Sensors to show</legend>
        {available.map((p) => (
          <label key={p} className="flex items-center gap-1.5">
            <input
              type="checkbox"
              className="size-4 accent-moss"
              checked={shown.includes(p)}
              onChange={(e) => setShown((s) => (e.target.checked ? [...s, p] : s.filter((x) => x !== p)))}
            />
            <span className="inline-block h-0.5 w-4" style={{ background: TRACE_COLOR[p] }} aria-hidden="true" />
            {placementLabel(p)}
          </label>
        ))}
      </fieldset>
      <div className="card p-3">
        {failed ? (
          <ErrorState title="The signal could not be loaded" error={failed.q.error} onRetry={() => void failed.q.refetch()} />
        ) : pending ? (
          <LoadingState label="Loading the signal…" />
        ) : traces.length === 0 ? (
          <p className="p-6 text-ink-soft">Choose a sensor to show its signal.</p>
        ) : (
          <SignalChart traces={traces} durationS={analysis.session.durationS} />
        )}
      </div>
    </Section>
  );
}

function StrideTable({ a }: { a: Analysis }) {
  const [all, setAll] = useState(false);
  const rows = all ? a.strides : a.strides.slice(0, 40);
  return (
    <Section title={`Strides (${a.strides.length})`} id="strides" description="Times in seconds from the start of the recording. Strides left out of the steady-state metrics say why.">
      <Table>
        <thead>
          <tr>
            <Th>#</Th>
            <Th>Side</Th>
            <Th>IC (s)</Th>
            <Th>Stride (s)</Th>
            <Th>Stance %</Th>
            <Th>Swing %</Th>
            <Th>Double support %</Th>
            <Th>Used</Th>
          </tr>
        </thead>
        <tbody>
          {rows.map((s, i) => (
            <tr key={`${s.side}-${s.icS}`}>
              <Td className="tabular">{i + 1}</Td>
              <Td>{s.side}</Td>
              <Td className="tabular">{s.icS.toFixed(2)}</Td>
              <Td className="tabular">{s.strideTimeS.toFixed(3)}</Td>
              <Td className="tabular">{f(s.stancePct)}</Td>
              <Td className="tabular">{f(s.swingPct)}</Td>
              <Td className="tabular">{f(s.doubleSupportPct)}</Td>
              <Td>{s.steady ? <Badge tone="good">steady</Badge> : <Badge tone="neutral">{EXCLUDED_WORDS[s.excludedReason ?? ""] ?? "left out"}</Badge>}</Td>
            </tr>
          ))}
        </tbody>
      </Table>
      {a.strides.length > 40 ? (
        <Button variant="quiet" size="sm" className="no-print mt-2" onClick={() => setAll((v) => !v)}>
          {all ? "Show the first 40" : `Show all ${a.strides.length}`}
        </Button>
      ) : null}
    </Section>
  );
}

function QualityList({ a }: { a: Analysis }) {
  return (
    <Section title="Recording quality" id="quality">
      {a.quality.length === 0 ? (
        <p className="text-ink-soft">No quality issues were reported.</p>
      ) : (
        <ul className="card flex flex-col divide-y divide-line">
          {a.quality.map((q, i) => (
            <li key={`${q.code}-${i}`} className="flex flex-wrap items-start gap-2 p-3">
              <Badge tone={q.severity === "error" ? "alert" : q.severity === "warning" ? "caution" : "info"}>{q.severity}</Badge>
              <span className="flex flex-1 flex-col">
                <span className="font-semibold">
                  {qualityLabel(q.code)}
                  {q.placement ? ` (${placementLabel(q.placement)})` : ""}
                </span>
                <span>{q.message}</span>
              </span>
              <span className="font-mono text-xs text-ink-soft">{q.code}</span>
            </li>
          ))}
        </ul>
      )}
    </Section>
  );
}

function CouplingSection({ a, counts }: { a: Analysis; counts?: MetricCounts }) {
  return (
    <Section
      title="Arm swing and arm–leg coordination"
      id="arms"
      description="Arm swing is the sagittal range of motion per arm cycle. The relative phase of an arm and the opposite leg is shown only with its coupling strength R; when the locking is too weak for a phase to mean much, the analysis withholds it and says why."
    >
      <ArmSwingSummary a={a} counts={counts} />
      <div className="mt-3 grid gap-3 sm:grid-cols-2">
        <CouplingCard title="Left arm – right leg" c={a.metrics.armLeg.leftArmRightLeg} />
        <CouplingCard title="Right arm – left leg" c={a.metrics.armLeg.rightArmLeftLeg} />
      </div>
    </Section>
  );
}

export interface SessionPageProps {
  sessionId: string;
  notePanel?: (patientId: string) => ReactNode;
  /** Called after the walking aid is saved (the route refreshes the patient's trends with it). */
  onWalkingAidSaved?: (patientId: string) => void;
}

export function SessionPage({ sessionId, notePanel, onWalkingAidSaved }: SessionPageProps) {
  const { data: s } = useSession(sessionId);
  const when = new Date(s.recordedAt).toLocaleString(undefined, { dateStyle: "full", timeStyle: "short" });
  return (
    <div>
      <PageHeader
        eyebrow={
          <Link to={`/clinician/patients/${s.patientId}`} className="underline-offset-2 hover:underline">
            ← Patient trends
          </Link>
        }
        title={`Session of ${when}`}
        actions={
          <Button variant="secondary" icon={<IconPrint />} onClick={() => window.print()}>
            Print report
          </Button>
        }
      >
        {s.algorithmVersion ? `Analysis version ${s.algorithmVersion}. ` : ""}
        {s.durationS ? `${Math.round(s.durationS)} s recorded.` : ""}
      </PageHeader>
      <p className="print-only mb-4 text-sm">Session report printed {new Date().toLocaleString()}. Pendula supports clinical judgement; it does not diagnose.</p>
      <p className="print-only mb-4 text-sm">Walking aid: {walkingAidLabel(s.walkingAid)}.</p>
      <div className="card mb-6 p-4">
        <WalkingAidEditor sessionId={s.id} current={s.walkingAid} onSaved={onWalkingAidSaved ? () => onWalkingAidSaved(s.patientId) : undefined} />
      </div>

      {s.status === "failed" ? (
        <ErrorState title="Processing failed" error={new Error(s.error ?? "The worker reported no reason.")} />
      ) : s.status !== "done" || !s.analysis ? (
        <EmptyState title={s.status === "queued" ? "Waiting to be processed" : "Being processed"}>Results appear here when the analysis has finished.</EmptyState>
      ) : (
        <>
          <Section
            title="Summary"
            id="summary"
            description="Means over the steady strides, each with the number of strides or steps behind it. A value from few strides varies more from week to week; read it with the recording and the patient, not alone."
          >
            <MetricsGrid a={s.analysis} counts={s.metricCounts} />
          </Section>
          <CouplingSection a={s.analysis} counts={s.metricCounts} />
          <SignalSection sessionId={s.id} analysis={s.analysis} />
          <QualityList a={s.analysis} />
          <StrideTable a={s.analysis} />
        </>
      )}
      {notePanel ? notePanel(s.patientId) : null}
    </div>
  );
}
