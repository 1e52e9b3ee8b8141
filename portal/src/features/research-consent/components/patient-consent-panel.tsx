import { useState } from "react";
import { Button, ErrorState, FormMessage, LoadingState, Section } from "@/components/ui";
import { describeError } from "@/lib/api-error";
import { formatDateTime, formatLongDate } from "@/lib/format";
import { useConsent, useRecordConsent } from "../api/consent";


/**
 * The patient's own say over research use of their walks, in plain words. Saying yes or no is
 * recorded with the time; withdrawing never changes their care.
 */
export function PatientConsentPanel({ patientId }: { patientId: string }) {
  const consent = useConsent(patientId);
  const record = useRecordConsent(patientId);
  const [confirmWithdraw, setConfirmWithdraw] = useState(false);

  return (
    <Section title="Research use of your walks" id="research-consent">
      {consent.isPending ? (
        <LoadingState label="Loading your research choice…" />
      ) : consent.isError ? (
        <ErrorState title="Your research choice could not be loaded" error={consent.error} onRetry={() => void consent.refetch()} />
      ) : (
        <div className="card flex flex-col gap-3 p-5 text-[1.05rem]">
          <p>
            Researchers study walking after spinal cord injury, stroke and Parkinson&apos;s disease. With your permission, the measurements of your
            weekly walks can be part of that research. Researchers never see your name, your birthday, the dates of your walks or your notes: they see
            a code instead of your name, your age within five years, and rounded measurements.
          </p>
          {consent.data.inForce ? (
            <p className="font-semibold text-moss-deep">
              <span aria-hidden="true">✓ </span>
              You said yes on {formatLongDate(consent.data.since!)}. Walks you do from then on may be used for research.
            </p>
          ) : consent.data.awaitingConfirmation ? (
            <p className="font-semibold text-ink">
              Your care team noted that you would like to take part. It only counts once you confirm it here yourself.
            </p>
          ) : (
            <p className="font-semibold text-ink">Your walks are not used for research.</p>
          )}
          <p className="text-ink-soft">
            This is your choice. Saying no, or changing your mind later, does not change your care, your care team or your weekly test in any way.
          </p>
          {consent.data.inForce ? (
            confirmWithdraw ? (
              <div className="flex flex-col gap-2 rounded-lg border border-line bg-sand p-4">
                <p>
                  From now on, your new walks will not be used for research. Walks recorded while you had said yes may stay in research already
                  done.
                </p>
                <div className="flex flex-wrap gap-3">
                  <Button variant="secondary" busy={record.isPending} onClick={() => record.mutate({ kind: "withdrawn" }, { onSuccess: () => setConfirmWithdraw(false) })}>
                    Yes, stop research use
                  </Button>
                  <Button variant="quiet" onClick={() => setConfirmWithdraw(false)}>
                    Keep my choice
                  </Button>
                </div>
              </div>
            ) : (
              <div>
                <Button variant="secondary" onClick={() => setConfirmWithdraw(true)}>
                  Stop research use of my walks
                </Button>
              </div>
            )
          ) : (
            <div className="flex flex-wrap gap-3">
              <Button busy={record.isPending} onClick={() => record.mutate({ kind: "given" })}>
                {consent.data.awaitingConfirmation ? "Yes, I confirm" : "Yes, my walks may be used for research"}
              </Button>
              {consent.data.awaitingConfirmation ? (
                <Button variant="secondary" busy={record.isPending} onClick={() => record.mutate({ kind: "withdrawn" })}>
                  No, I do not want to take part
                </Button>
              ) : null}
            </div>
          )}
          {record.isError ? <FormMessage tone="error">{describeError(record.error)}</FormMessage> : null}
          {consent.data.events.length > 0 ? (
            <details className="text-ink-soft">
              <summary className="cursor-pointer">Your choices so far</summary>
              <ul className="mt-2 list-disc pl-6">
                {consent.data.events.map((e) => (
                  <li key={e.id}>
                    {formatDateTime(e.at)}: {e.kind === "given" ? (e.counts ? "yes" : "noted by your care team, waiting for you") : "no"}
                    {e.recorderRole === "patient" ? " (you)" : ""}
                  </li>
                ))}
              </ul>
            </details>
          ) : null}
        </div>
      )}
    </Section>
  );
}
