import { IconFile } from "@/components/icons";
import { Badge, Table, Td, Th } from "@/components/ui";
import { formatDuration } from "@/lib/format";
import { placementWords } from "@/lib/placement-labels";
import type { PrecheckSummary } from "../precheck/precheck-types";

const VERDICT = {
  ready: { tone: "good", label: "Looks good", text: "This recording looks ready to send." },
  check: { tone: "caution", label: "Worth a look", text: "This recording can be sent, but read the notes below first." },
  redo: { tone: "alert", label: "Not usable yet", text: "Pendula could not find enough walking to measure. Check the notes below; you may need to add other files or record again on another day." },
} as const;

const FORMAT_WORDS = { "pendula-csv-v1": "Sensor file", "bids-motion": "BIDS motion data", "bids-sidecar": "BIDS description", unknown: "Not recognised" } as const;

export function PrecheckSummaryView({ summary }: { summary: PrecheckSummary }) {
  const v = VERDICT[summary.verdict];
  const recognised = summary.files.filter((f) => f.recognised).length;
  return (
    <section aria-labelledby="precheck-title" className="card flex flex-col gap-5 p-5 sm:p-6">
      <div className="flex flex-wrap items-center gap-3">
        <h2 id="precheck-title" className="text-lg font-bold">
          Check of your recording
        </h2>
        <Badge tone={v.tone}>{v.label}</Badge>
      </div>
      <p>{v.text}</p>
      <dl className="grid gap-3 sm:grid-cols-4">
        <Fact label="Files recognised" value={`${recognised} of ${summary.files.length}`} />
        <Fact label="Length of recording" value={formatDuration(summary.durationS)} />
        <Fact label="Strides found" value={String(summary.strideCount)} hint={summary.strideCount ? `${summary.steadyStrideCount} steady ones used for measuring` : undefined} />
        <Fact label="Sensor positions" value={summary.placements.length ? summary.placements.map(placementWords).join(", ") : "none found"} />
      </dl>

      {summary.analysisProblem ? (
        <p role="alert" className="rounded-lg bg-clay-wash p-3 text-clay-deep">
          {summary.analysisProblem}
        </p>
      ) : null}

      {summary.notices.length ? (
        <div>
          <h3 className="mb-2 font-bold">Notes</h3>
          <ul className="flex flex-col gap-2">
            {summary.notices.map((n, i) => (
              <li key={`${n.code}-${i}`} className="flex flex-wrap items-start gap-2">
                <Badge tone={n.severity === "error" ? "alert" : n.severity === "warning" ? "caution" : "info"}>
                  {n.severity === "error" ? "Problem" : n.severity === "warning" ? "Check" : "Note"}
                </Badge>
                <span className="flex-1">{n.text}</span>
              </li>
            ))}
          </ul>
        </div>
      ) : null}

      <Table caption="Files you added">
        <thead>
          <tr>
            <Th>File</Th>
            <Th>Type</Th>
            <Th>Sensor</Th>
            <Th>Position (from the file)</Th>
            <Th>Length</Th>
          </tr>
        </thead>
        <tbody>
          {summary.files.map((f) => (
            <tr key={f.fileName}>
              <Td>
                <span className="flex items-center gap-1.5 break-all">
                  <IconFile className="shrink-0" />
                  {f.fileName}
                </span>
                {f.problem ? <span className="mt-1 block text-xs text-clay-deep">{f.problem}</span> : null}
              </Td>
              <Td>
                {f.recognised ? <Badge tone="good">{FORMAT_WORDS[f.format]}</Badge> : <Badge tone="alert">{f.problem ? "Could not read" : FORMAT_WORDS[f.format]}</Badge>}
              </Td>
              <Td className="font-mono text-xs">{f.deviceSerial ?? "—"}</Td>
              <Td>{f.placement ? f.placement.split(", ").map(placementWords).join(", ") : f.recognised && f.format !== "bids-sidecar" ? "not written in the file; your care team's records are used" : "—"}</Td>
              <Td className="tabular">{f.durationS === null ? "—" : formatDuration(f.durationS)}</Td>
            </tr>
          ))}
        </tbody>
      </Table>
    </section>
  );
}

function Fact({ label, value, hint }: { label: string; value: string; hint?: string }) {
  return (
    <div className="rounded-lg bg-sand p-3">
      <dt className="text-sm text-ink-soft">{label}</dt>
      <dd className="tabular text-lg font-bold">{value}</dd>
      {hint ? <dd className="text-xs text-ink-soft">{hint}</dd> : null}
    </div>
  );
}
