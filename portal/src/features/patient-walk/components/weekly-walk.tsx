import { useState } from "react";
import { IconInfo } from "@/components/icons";
import { Button, ErrorState, FormMessage, PageHeader, TextField } from "@/components/ui";
import { describeError, isApiError } from "@/lib/api-error";
import { localDateTimeInputValue } from "@/lib/calendar-day";
import { useUploadSession, type FileProgress } from "../api/upload-session";
import { PrecheckCancelled, usePrecheck } from "../precheck/use-precheck";
import { FileDrop } from "./file-drop";
import { PrecheckProgressView } from "./precheck-progress";
import { PrecheckSummaryView } from "./precheck-summary";
import { SafetyChecklist } from "./safety-checklist";
import { FileProgressList, ProcessingStatus } from "./upload-status";

type Step = "checklist" | "files";

/** Safety checklist → files → in-browser check → upload with progress → processing status. */
export function WeeklyWalk() {
  const [step, setStep] = useState<Step>("checklist");
  const [files, setFiles] = useState<File[]>([]);
  const [progress, setProgress] = useState<FileProgress[]>([]);
  const precheck = usePrecheck();
  const upload = useUploadSession(setProgress);
  // BIDS Motion files carry no clock time (the standard keeps it in a separate scans file), so the
  // person says when they walked; sensor CSV files carry their own start time.
  const hasBids = files.some((f) => /_motion\.tsv$/i.test(f.name));
  const [walkedAt, setWalkedAt] = useState(() => localDateTimeInputValue());
  const walkedAtValid = !hasBids || (walkedAt !== "" && !Number.isNaN(new Date(walkedAt).getTime()) && new Date(walkedAt).getTime() <= Date.now() + 60_000);

  function addFiles(added: File[]) {
    // Adding more files (e.g. a forgotten BIDS sidecar) keeps the earlier ones; same name replaces.
    const merged = new Map(files.map((f) => [f.name, f]));
    for (const f of added) merged.set(f.name, f);
    const next = [...merged.values()];
    setFiles(next);
    upload.reset();
    precheck.mutate(next);
  }

  function reset() {
    setFiles([]);
    setProgress([]);
    precheck.reset();
    upload.reset();
  }

  return (
    <div>
      <PageHeader eyebrow="This week" title="Your walking test">
        A short walk at home at your usual pace, wearing your four sensors. Then add the files here and Pendula checks them before sending them to your care team.
      </PageHeader>

      {step === "checklist" ? (
        <SafetyChecklist onAcknowledged={() => setStep("files")} />
      ) : (
        <div className="flex flex-col gap-6">
          <p className="flex items-start gap-2 rounded-lg bg-sky-wash p-3 text-sky-deep">
            <IconInfo className="mt-0.5 shrink-0" />
            <span>Remember: stop and sit down if you feel unwell. Pendula does not notice falls; call for help if you need it.</span>
          </p>
          <h2 className="text-lg font-bold">3. Add your sensor files</h2>
          {!upload.isPending && !upload.isSuccess ? <FileDrop onFiles={addFiles} /> : null}

          {precheck.isPending ? <PrecheckProgressView progress={precheck.progress} onStop={reset} /> : null}
          {precheck.isError && !(precheck.error instanceof PrecheckCancelled) ? <ErrorState title="The check could not run" error={precheck.error} /> : null}
          {precheck.data && !precheck.isPending ? <PrecheckSummaryView summary={precheck.data} /> : null}

          {hasBids && precheck.data && !upload.isPending && !upload.isSuccess ? (
            <div className="max-w-xs">
              <TextField
                type="datetime-local"
                label="When did you do this walk?"
                hint="BIDS files do not record the time of the walk, so Pendula takes it from here."
                value={walkedAt}
                max={localDateTimeInputValue()}
                onChange={(e) => setWalkedAt(e.target.value)}
                error={walkedAtValid ? null : "Enter the date and time of the walk (not in the future)."}
                required
              />
            </div>
          ) : null}

          {precheck.data && !upload.isPending && !upload.isSuccess ? (
            <div className="flex flex-wrap gap-3">
              <Button
                size="lg"
                disabled={!walkedAtValid}
                onClick={() => upload.mutate({ files, startUtc: hasBids ? new Date(walkedAt).toISOString() : undefined })}
                variant={precheck.data.verdict === "redo" ? "secondary" : "primary"}
              >
                {precheck.data.verdict === "redo" ? "Send anyway" : "Send to my care team"}
              </Button>
              <Button variant="quiet" onClick={reset}>
                Start again with other files
              </Button>
            </div>
          ) : null}

          {upload.isPending || (upload.isSuccess && progress.length) ? (
            <section className="card p-5 sm:p-6" aria-labelledby="upload-title">
              <h2 id="upload-title" className="mb-3 text-lg font-bold">
                {upload.isPending ? "Sending…" : "Sent"}
              </h2>
              <FileProgressList progress={progress.length ? progress : files.map((f) => ({ name: f.name, sizeBytes: f.size, fraction: 0 }))} />
            </section>
          ) : null}
          {upload.isError ? (
            <FormMessage tone="error">
              {describeError(upload.error)}
              {isApiError(upload.error) && upload.error.status === 422
                ? " Check that these files come from your own sensors; if they do, your care team can check their list of your sensors."
                : ""}
            </FormMessage>
          ) : null}
          {upload.data ? <ProcessingStatus sessionId={upload.data.id} duplicate={Boolean(upload.data.duplicate)} /> : null}
        </div>
      )}
    </div>
  );
}
