import { Link } from "react-router-dom";
import { IconCheck, IconClock } from "@/components/icons";
import { Badge, ErrorState, Spinner } from "@/components/ui";
import { formatPercent } from "@/lib/format";
import { useSessionStatus } from "../api/get-session-status";
import type { FileProgress } from "../api/upload-session";

export function FileProgressList({ progress }: { progress: FileProgress[] }) {
  return (
    <ul className="flex flex-col gap-3" aria-label="Upload progress">
      {progress.map((p) => {
        const pct = Math.round(p.fraction * 100);
        return (
          <li key={p.name} className="flex flex-col gap-1">
            <span className="flex justify-between gap-3 text-sm">
              <span className="break-all font-semibold">{p.name}</span>
              <span className="tabular text-ink-soft">{pct === 100 ? "sent" : formatPercent(pct)}</span>
            </span>
            <progress className="h-2 w-full overflow-hidden rounded accent-moss" max={100} value={pct} aria-label={`${p.name} upload`}>
              {pct} %
            </progress>
          </li>
        );
      })}
    </ul>
  );
}

/** Follows the server's processing of the uploaded session until it is done or has failed. */
export function ProcessingStatus({ sessionId, duplicate }: { sessionId: string; duplicate: boolean }) {
  const { data, error, refetch } = useSessionStatus(sessionId);
  if (error) return <ErrorState title="We could not check on your walk" error={error} onRetry={() => void refetch()} />;

  const status = data?.status ?? "queued";
  return (
    <section aria-live="polite" className="card flex flex-col gap-3 p-5 sm:p-6">
      {duplicate ? <p className="text-ink-soft">You had already sent these same files, so Pendula kept the first copy.</p> : null}
      {status === "done" ? (
        <>
          <p className="flex items-center gap-2 text-lg font-bold text-moss-deep">
            <IconCheck /> Thank you. This week's walk has been measured.
          </p>
          <p>Your care team can now see it. They will talk with you about what it means.</p>
          <p>
            <Link to="/patient/progress" className="font-semibold text-sky-deep underline underline-offset-2">
              See your progress over the weeks
            </Link>
          </p>
        </>
      ) : status === "failed" ? (
        <>
          <Badge tone="alert">Could not be measured</Badge>
          <p>Your files are saved safely, but measuring them did not work. Your care team can see the problem and try again; you do not need to do anything now.</p>
        </>
      ) : (
        <p className="flex items-center gap-3">
          {status === "queued" ? <IconClock /> : <Spinner size="sm" label="" />}
          <span>
            {status === "queued" ? "Sent. Waiting to be measured…" : `Being measured${data?.progressPct ? ` (${formatPercent(data.progressPct)})` : ""}…`}
          </span>
        </p>
      )}
    </section>
  );
}
