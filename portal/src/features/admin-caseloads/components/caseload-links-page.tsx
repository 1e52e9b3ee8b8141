import { useState, type FormEvent } from "react";
import { Badge, Button, EmptyState, ErrorState, LoadingState, PageHeader, SelectField, Table, Td, TextField, Th } from "@/components/ui";
import { describeError } from "@/lib/api-error";
import { formatDateTime } from "@/lib/format";
import {
  CASELOAD_LINK_PAGE_SIZE,
  createCaseloadLinkRequest,
  endCaseloadLinkRequest,
  useCaseloadLinks,
  useClinicianOptions,
  useCreateCaseloadLink,
  useEndCaseloadLink,
  usePatientOptions,
  type CaseloadLinkFilters,
  type CaseloadLinkView,
} from "../api/caseload-links";

const REASON_HINT = "Why this access is needed, in a few words. Kept in the audit log; no clinical details.";

/** The "give access" form: clinician, patient and a reason, all required. */
function GiveAccessForm() {
  const clinicians = useClinicianOptions();
  const patients = usePatientOptions();
  const create = useCreateCaseloadLink();
  const [clinicianId, setClinicianId] = useState("");
  const [patientId, setPatientId] = useState("");
  const [reason, setReason] = useState("");
  const [errors, setErrors] = useState<Record<string, string>>({});

  function submit(event: FormEvent) {
    event.preventDefault();
    const parsed = createCaseloadLinkRequest.safeParse({ clinicianId, patientId, reason });
    if (!parsed.success) {
      const next: Record<string, string> = {};
      for (const issue of parsed.error.issues) {
        const key = String(issue.path[0]);
        next[key] ??= key === "clinicianId" ? "choose a clinician" : key === "patientId" ? "choose a patient" : issue.message;
      }
      return setErrors(next);
    }
    setErrors({});
    create.mutate(parsed.data, {
      onSuccess: () => {
        setReason("");
        setPatientId("");
      },
    });
  }

  return (
    <form onSubmit={submit} noValidate aria-labelledby="give-access-title" className="card mb-6 grid gap-4 p-5">
      <div>
        <h2 id="give-access-title" className="text-lg font-bold text-ink">
          Give a clinician access to a patient
        </h2>
        <p className="text-sm text-ink-soft">
          The clinician can then read this patient&apos;s walks, trends, notes and training log until the access is ended. Give access only
          as your service&apos;s own procedures allow; who did it, when and why are kept.
        </p>
      </div>
      <div className="grid gap-4 md:grid-cols-3">
        <SelectField
          label="Clinician"
          value={clinicianId}
          onChange={(e) => setClinicianId(e.target.value)}
          error={clinicians.isError ? describeError(clinicians.error) : errors.clinicianId}
        >
          <option value="">{clinicians.isPending ? "Loading…" : "Choose a clinician"}</option>
          {clinicians.data?.map((c) => (
            <option key={c.id} value={c.id}>
              {c.label}
            </option>
          ))}
        </SelectField>
        <SelectField
          label="Patient"
          value={patientId}
          onChange={(e) => setPatientId(e.target.value)}
          error={patients.isError ? describeError(patients.error) : errors.patientId}
        >
          <option value="">{patients.isPending ? "Loading…" : "Choose a patient"}</option>
          {patients.data?.map((p) => (
            <option key={p.id} value={p.id}>
              {p.label}
            </option>
          ))}
        </SelectField>
        <TextField label="Reason" hint={REASON_HINT} value={reason} maxLength={500} onChange={(e) => setReason(e.target.value)} error={errors.reason} />
      </div>
      <div className="flex flex-wrap items-center gap-3">
        <Button type="submit" busy={create.isPending}>
          Give access
        </Button>
        <span aria-live="polite" className="text-sm">
          {create.isError ? (
            <span role="alert" className="font-semibold text-clay-deep">
              <span aria-hidden="true">⚠ </span>
              {describeError(create.error)}
            </span>
          ) : null}
          {create.isSuccess ? (
            <span className="font-semibold text-moss-deep">
              ✓ {create.data.clinicianName} can now read {create.data.patientName}&apos;s data
            </span>
          ) : null}
        </span>
      </div>
    </form>
  );
}

/** Ending asks for a reason too; the row then moves to the history. */
function EndAccess({ link }: { link: CaseloadLinkView }) {
  const end = useEndCaseloadLink();
  const [open, setOpen] = useState(false);
  const [reason, setReason] = useState("");
  const [problem, setProblem] = useState<string | null>(null);

  if (!open) {
    return (
      <Button size="sm" variant="secondary" onClick={() => setOpen(true)} aria-label={`End ${link.clinicianName}'s access to ${link.patientName}`}>
        End access…
      </Button>
    );
  }
  function submit(event: FormEvent) {
    event.preventDefault();
    const parsed = endCaseloadLinkRequest.safeParse({ reason });
    if (!parsed.success) return setProblem(parsed.error.issues[0]?.message ?? "give a reason");
    setProblem(null);
    end.mutate({ id: link.id, input: parsed.data });
  }
  return (
    <form onSubmit={submit} noValidate className="grid min-w-64 gap-2" aria-label={`End ${link.clinicianName}'s access to ${link.patientName}`}>
      <TextField label="Reason for ending" value={reason} maxLength={500} onChange={(e) => setReason(e.target.value)} error={problem} />
      <div className="flex gap-2">
        <Button type="submit" size="sm" variant="danger" busy={end.isPending}>
          End access
        </Button>
        <Button size="sm" variant="quiet" onClick={() => setOpen(false)}>
          Keep
        </Button>
      </div>
      {end.isError ? (
        <p role="alert" className="text-xs font-semibold text-clay-deep">
          <span aria-hidden="true">⚠ </span>
          {describeError(end.error)}
        </p>
      ) : null}
    </form>
  );
}

export function CaseloadLinksPage() {
  const clinicians = useClinicianOptions();
  const patients = usePatientOptions();
  const [filters, setFilters] = useState<CaseloadLinkFilters>({ state: "active", limit: CASELOAD_LINK_PAGE_SIZE, offset: 0 });
  const links = useCaseloadLinks(filters);
  const set = (patch: Partial<CaseloadLinkFilters>) => setFilters((f) => ({ ...f, offset: 0, ...patch }));

  return (
    <div>
      <PageHeader eyebrow="Administration" title="Caseloads">
        Which clinician can read which patient&apos;s data. Access is given and ended here only, each time with a reason; ended access stays
        listed as history.
      </PageHeader>

      <GiveAccessForm />

      <div className="mb-4 grid max-w-3xl gap-4 sm:grid-cols-3" role="search" aria-label="Filter caseload links">
        <SelectField label="Show" value={filters.state} onChange={(e) => set({ state: e.target.value as CaseloadLinkFilters["state"] })}>
          <option value="active">Current access</option>
          <option value="ended">Ended access</option>
          <option value="all">Current and ended</option>
        </SelectField>
        <SelectField label="Clinician" value={filters.clinicianId ?? ""} onChange={(e) => set({ clinicianId: e.target.value || undefined })}>
          <option value="">All clinicians</option>
          {clinicians.data?.map((c) => (
            <option key={c.id} value={c.id}>
              {c.label}
            </option>
          ))}
        </SelectField>
        <SelectField label="Patient" value={filters.patientId ?? ""} onChange={(e) => set({ patientId: e.target.value || undefined })}>
          <option value="">All patients</option>
          {patients.data?.map((p) => (
            <option key={p.id} value={p.id}>
              {p.label}
            </option>
          ))}
        </SelectField>
      </div>

      {links.isPending ? (
        <LoadingState label="Loading caseload links…" />
      ) : links.isError ? (
        <ErrorState title="Caseload links could not be loaded" error={links.error} onRetry={() => void links.refetch()} />
      ) : links.data.items.length === 0 ? (
        <EmptyState title="No caseload links match">Change the filters, or give access above.</EmptyState>
      ) : (
        <div className="grid gap-3">
          <Table
            caption={`Links ${links.data.offset + 1}–${links.data.offset + links.data.items.length} of ${links.data.total}`}
            aria-busy={links.isFetching || undefined}
          >
            <thead>
              <tr>
                <Th>Clinician</Th>
                <Th>Patient</Th>
                <Th>Access</Th>
                <Th>Given</Th>
                <Th>Ended</Th>
                <Th>
                  <span className="sr-only">Actions</span>
                </Th>
              </tr>
            </thead>
            <tbody>
              {links.data.items.map((l) => (
                <tr key={l.id}>
                  <Td>
                    <span className="block font-semibold">{l.clinicianName}</span>
                    <span className="text-xs text-ink-soft">{l.clinicianEmail}</span>
                  </Td>
                  <Td className="font-semibold">{l.patientName}</Td>
                  <Td>{l.active ? <Badge tone="good">Current</Badge> : <Badge tone="neutral">Ended</Badge>}</Td>
                  <Td className="text-xs">
                    <time dateTime={l.createdAt} className="block tabular">
                      {formatDateTime(l.createdAt)}
                    </time>
                    <span className="block text-ink-soft">{l.createdByName ? `by ${l.createdByName}` : "recorded before links were tracked"}</span>
                    {l.reason ? <span className="block">“{l.reason}”</span> : null}
                  </Td>
                  <Td className="text-xs">
                    {l.endedAt ? (
                      <>
                        <time dateTime={l.endedAt} className="block tabular">
                          {formatDateTime(l.endedAt)}
                        </time>
                        <span className="block text-ink-soft">{l.endedByName ? `by ${l.endedByName}` : "removed without a recorded reason"}</span>
                        {l.endReason ? <span className="block">“{l.endReason}”</span> : null}
                      </>
                    ) : (
                      <span className="text-ink-soft">—</span>
                    )}
                  </Td>
                  <Td>{l.active ? <EndAccess link={l} /> : null}</Td>
                </tr>
              ))}
            </tbody>
          </Table>
          <nav aria-label="Pages of caseload links" className="flex items-center gap-3">
            <Button
              variant="secondary"
              size="sm"
              disabled={filters.offset === 0}
              onClick={() => setFilters((f) => ({ ...f, offset: Math.max(0, f.offset - CASELOAD_LINK_PAGE_SIZE) }))}
            >
              ← Newer
            </Button>
            <span className="text-sm text-ink-soft" aria-live="polite">
              Page {Math.floor(links.data.offset / CASELOAD_LINK_PAGE_SIZE) + 1} of {Math.max(1, Math.ceil(links.data.total / CASELOAD_LINK_PAGE_SIZE))}
            </span>
            <Button
              variant="secondary"
              size="sm"
              disabled={filters.offset + CASELOAD_LINK_PAGE_SIZE >= links.data.total}
              onClick={() => setFilters((f) => ({ ...f, offset: f.offset + CASELOAD_LINK_PAGE_SIZE }))}
            >
              Older →
            </Button>
          </nav>
        </div>
      )}
    </div>
  );
}
