import { useState, type FormEvent } from "react";
import { Button, EmptyState, ErrorState, LoadingState, PageHeader, Table, Td, TextField, Th } from "@/components/ui";
import { formatDateTimeSeconds } from "@/lib/format";
import {
  AUDIT_PAGE_SIZE,
  EMPTY_AUDIT_FILTER,
  auditFilterSchema,
  toAuditQuery,
  useAuditEvents,
  type AuditEventView,
  type AuditFilterInput,
  type AuditQuery,
} from "../api/audit-events";

function detailsText(e: AuditEventView): string {
  if (e.withheld.includes("details")) return "clinical details not shown";
  const details = e.details;
  if (!details) return "";
  return Object.entries(details)
    .map(([k, v]) => `${k}: ${typeof v === "object" ? JSON.stringify(v) : String(v)}`)
    .join(" · ");
}

export function AuditLogPage() {
  const [draft, setDraft] = useState<AuditFilterInput>(EMPTY_AUDIT_FILTER);
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [query, setQuery] = useState<AuditQuery>({ limit: AUDIT_PAGE_SIZE, offset: 0 });
  const events = useAuditEvents(query);

  const set = (key: keyof AuditFilterInput) => (e: { target: { value: string } }) => setDraft((d) => ({ ...d, [key]: e.target.value }));

  function apply(event: FormEvent) {
    event.preventDefault();
    const parsed = auditFilterSchema.safeParse(draft);
    if (!parsed.success) {
      const next: Record<string, string> = {};
      for (const issue of parsed.error.issues) next[String(issue.path[0])] ??= issue.message;
      return setErrors(next);
    }
    setErrors({});
    setQuery(toAuditQuery(parsed.data, 0));
  }

  function clear() {
    setDraft(EMPTY_AUDIT_FILTER);
    setErrors({});
    setQuery({ limit: AUDIT_PAGE_SIZE, offset: 0 });
  }

  const page = (offset: number) => setQuery((q) => ({ ...q, offset }));

  return (
    <div>
      <PageHeader eyebrow="Administration" title="Audit log">
        Every sign-in, every read of a patient&apos;s data, every refused attempt to reach one, every export and every administrative change,
        newest first. A patient&apos;s network address and browser, and training or walking-aid details, are not shown here.
      </PageHeader>
      <form onSubmit={apply} noValidate aria-label="Filter audit events" className="card mb-5 grid gap-4 p-5">
        <div className="grid gap-4 md:grid-cols-3 lg:grid-cols-5">
          <TextField label="Action" hint="Exact, or a prefix ending in '.' (auth.)" value={draft.action} onChange={set("action")} error={errors.action} />
          <TextField label="Actor id" value={draft.actorId} onChange={set("actorId")} error={errors.actorId} />
          <TextField label="Patient id" value={draft.patientId} onChange={set("patientId")} error={errors.patientId} />
          <TextField label="From day" type="date" value={draft.fromDay} onChange={set("fromDay")} error={errors.fromDay} />
          <TextField label="To day" type="date" value={draft.toDay} onChange={set("toDay")} error={errors.toDay} hint="Includes the whole day" />
        </div>
        <div className="flex gap-3">
          <Button type="submit">Apply filters</Button>
          <Button variant="quiet" onClick={clear}>
            Clear
          </Button>
        </div>
      </form>

      {events.isPending ? (
        <LoadingState label="Loading audit events…" />
      ) : events.isError ? (
        <ErrorState title="The audit log could not be loaded" error={events.error} onRetry={() => void events.refetch()} />
      ) : events.data.items.length === 0 ? (
        <EmptyState title="No events match these filters">Widen the days or clear the filters.</EmptyState>
      ) : (
        <div className="grid gap-3">
          <Table
            caption={`Events ${events.data.offset + 1}–${events.data.offset + events.data.items.length} of ${events.data.total}`}
            aria-busy={events.isFetching || undefined}
          >
            <thead>
              <tr>
                <Th>When</Th>
                <Th>Who</Th>
                <Th>Action</Th>
                <Th>Resource</Th>
                <Th>From</Th>
                <Th>Details</Th>
              </tr>
            </thead>
            <tbody>
              {events.data.items.map((e) => (
                <tr key={e.id}>
                  <Td className="whitespace-nowrap tabular text-xs">
                    <time dateTime={e.at}>{formatDateTimeSeconds(e.at)}</time>
                  </Td>
                  <Td className="text-xs">
                    <span className="block font-semibold text-ink">{e.actorEmail ?? "system"}</span>
                    {e.actorRole ? <span className="text-ink-soft">{e.actorRole}</span> : null}
                  </Td>
                  <Td className="font-mono text-xs">{e.action}</Td>
                  <Td className="text-xs">
                    {e.resourceType}
                    {e.resourceId ? <span className="block break-all font-mono text-ink-soft">{e.resourceId}</span> : null}
                  </Td>
                  <Td className="font-mono text-xs">{e.withheld.includes("ip") ? <span className="font-sans text-ink-soft">not shown (patient)</span> : (e.ip ?? "—")}</Td>
                  <Td className="max-w-xs break-words text-xs text-ink-soft">{detailsText(e)}</Td>
                </tr>
              ))}
            </tbody>
          </Table>
          <nav aria-label="Pages of audit events" className="flex items-center gap-3">
            <Button variant="secondary" size="sm" disabled={query.offset === 0} onClick={() => page(Math.max(0, query.offset - AUDIT_PAGE_SIZE))}>
              ← Newer
            </Button>
            <span className="text-sm text-ink-soft" aria-live="polite">
              Page {Math.floor(events.data.offset / AUDIT_PAGE_SIZE) + 1} of {Math.max(1, Math.ceil(events.data.total / AUDIT_PAGE_SIZE))}
            </span>
            <Button
              variant="secondary"
              size="sm"
              disabled={query.offset + AUDIT_PAGE_SIZE >= events.data.total}
              onClick={() => page(query.offset + AUDIT_PAGE_SIZE)}
            >
              Older →
            </Button>
          </nav>
        </div>
      )}
    </div>
  );
}
