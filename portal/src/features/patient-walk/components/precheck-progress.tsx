import { Button, Spinner } from "@/components/ui";
import type { PrecheckProgress } from "../precheck/precheck-types";

export function progressWords(p: PrecheckProgress): string {
  if (p.stage === "reading") return `Reading file ${p.fileNumber ?? 1} of ${p.fileCount}…`;
  if (p.stage === "parsing") return "Reading the sensor data…";
  return "Looking for your steps…";
}

/**
 * The running check: a labelled progress bar (role=progressbar with its value and words for screen
 * readers) and a way to stop, which also removes the files so none is sent by mistake.
 */
export function PrecheckProgressView({ progress, onStop }: { progress: PrecheckProgress | null; onStop: () => void }) {
  const pct = Math.round(100 * (progress?.fraction ?? 0));
  const words = progress ? progressWords(progress) : "Starting the check…";
  return (
    <section aria-labelledby="precheck-progress-title" className="card flex flex-col gap-3 p-5 sm:p-6">
      <h2 id="precheck-progress-title" className="flex items-center gap-3 text-lg font-bold">
        <Spinner label="" /> Checking your recording on this device
      </h2>
      <div
        role="progressbar"
        aria-labelledby="precheck-progress-title"
        aria-valuemin={0}
        aria-valuemax={100}
        aria-valuenow={pct}
        aria-valuetext={`${pct} %: ${words}`}
        className="h-2 w-full overflow-hidden rounded bg-sand"
      >
        <div className="h-full rounded bg-moss transition-[width]" style={{ width: `${pct}%` }} />
      </div>
      <p className="text-ink-soft" aria-live="polite">
        {words} Nothing is sent until you press send.
      </p>
      <div>
        <Button variant="quiet" onClick={onStop}>
          Stop and remove these files
        </Button>
      </div>
    </section>
  );
}
