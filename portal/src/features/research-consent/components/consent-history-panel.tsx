import { useState, type FormEvent } from "react";
import { Badge, Button, ErrorState, FormMessage, LoadingState, SelectField, Table, Td, TextField, Th } from "@/components/ui";
import { describeError } from "@/lib/api-error";
import { formatDateTime } from "@/lib/format";
import { useConsent, useRecordConsent } from "../api/consent";
import { describeConsentEvent } from "./consent-words";

const MIN_REASON = 10;

/**
 * Staff view of a patient's research consent: the state, every recorded change, and a form to
 * record one. A clinician's "given" is a proposal the patient confirms in their portal; an admin's
 * counts; a withdrawal always counts. Staff always give the reason the record rests on.
 */
export function ConsentHistoryPanel({ patientId, role }: { patientId: string; role: "clinician" | "admin" }) {
  const consent = useConsent(patientId);
  const record = useRecordConsent(patientId);
  const [kind, setKind] = useState<"given" | "withdrawn">("given");
  const [reason, setReason] = useState("");
  const [error, setError] = useState<string | null>(null);

  function submit(event: FormEvent) {
    event.preventDefault();
    if (reason.trim().length < MIN_REASON) {
      setError(`say what this rests on, at least ${MIN_REASON} characters`);
      return;
    }
    setError(null);
    record.mutate({ kind, reason: reason.trim() }, { onSuccess: () => setReason("") });
  }

  return (
    <section className="card grid gap-3 p-4" aria-labelledby="consent-history-heading">
      <h2 id="consent-history-heading" className="text-lg font-bold text-ink">
        Research consent
      </h2>
      {consent.isPending ? (
        <LoadingState label="Loading the consent history…" />
      ) : consent.isError ? (
        <ErrorState title="The consent history could not be loaded" error={consent.error} onRetry={() => void consent.refetch()} />
      ) : (
        <>
          <p>
            {consent.data.inForce ? (
              <Badge tone="good" icon="✓">
                In force since {formatDateTime(consent.data.since!)}
              </Badge>
            ) : consent.data.awaitingConfirmation ? (
              <Badge tone="caution" icon="…">
                Waiting for the patient&apos;s confirmation
              </Badge>
            ) : (
              <Badge tone="neutral" icon="–">
                Not in force
              </Badge>
            )}
          </p>
          <p className="text-sm text-ink-soft">
            Research exports include only walks recorded while consent was in force. It counts when the patient records it in their portal, or
            when an administrator records it with a reason; a clinician&apos;s entry waits for the patient.
          </p>
          {consent.data.events.length ? (
            <Table caption="Consent history, newest first">
              <thead>
                <tr>
                  <Th>When</Th>
                  <Th>Change</Th>
                  <Th>Reason</Th>
                </tr>
              </thead>
              <tbody>
                {consent.data.events.map((e) => (
                  <tr key={e.id}>
                    <Td className="whitespace-nowrap tabular">{formatDateTime(e.at)}</Td>
                    <Td>{describeConsentEvent(e)}</Td>
                    <Td className="text-sm text-ink-soft">{e.reason ?? "—"}</Td>
                  </tr>
                ))}
              </tbody>
            </Table>
          ) : (
            <p className="text-sm text-ink-soft">No consent recorded.</p>
          )}
          <form onSubmit={submit} noValidate className="grid gap-3 rounded-lg border border-line bg-sand p-3" aria-label="Record a consent change">
            <SelectField label="Record" value={kind} onChange={(e) => setKind(e.target.value as "given" | "withdrawn")}>
              <option value="given">{role === "clinician" ? "Consent given (the patient confirms it in their portal)" : "Consent given (counts)"}</option>
              <option value="withdrawn">Consent withdrawn</option>
            </SelectField>
            <TextField
              label="Reason"
              hint={role === "admin" ? "What the record rests on, e.g. the signed form on file" : "e.g. what the patient said, and when"}
              value={reason}
              onChange={(e) => setReason(e.target.value)}
              error={error ?? undefined}
              maxLength={500}
            />
            <div>
              <Button type="submit" variant="secondary" busy={record.isPending}>
                Record
              </Button>
            </div>
            {record.isError ? <FormMessage tone="error">{describeError(record.error)}</FormMessage> : null}
          </form>
        </>
      )}
    </section>
  );
}
