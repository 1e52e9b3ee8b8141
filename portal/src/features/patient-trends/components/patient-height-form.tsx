import { useState } from "react";
import { Button, FormMessage, TextField } from "@/components/ui";
import { ApiError } from "@/lib/api-client";
import { HEIGHT_CM_RANGE, patientUpdate, useReprocessSessions, useUpdatePatient } from "../api/trends";

/**
 * Standing height, entered by the clinician: walking speed and stride length scale with it. The
 * server refuses anything outside 100–230 cm with the reason, shown beside the field.
 */
export function PatientHeightForm({
  patientId,
  heightCm,
  processedSessionIds = [],
}: {
  patientId: string;
  heightCm: number | null | undefined;
  /** Sessions analysed so far: they keep their results until reprocessed with the new height. */
  processedSessionIds?: readonly string[];
}) {
  const [value, setValue] = useState(heightCm == null ? "" : String(heightCm));
  const [error, setError] = useState<string | null>(null);
  const [saved, setSaved] = useState(false);
  const mutation = useUpdatePatient(patientId);
  const reprocess = useReprocessSessions(patientId);
  const n = processedSessionIds.length;

  return (
    <form
      className="no-print flex flex-wrap items-end gap-3"
      aria-label="Patient height"
      noValidate
      onSubmit={(e) => {
        e.preventDefault();
        setSaved(false);
        const text = value.trim().replace(",", ".");
        const parsed = patientUpdate.safeParse({ heightCm: text === "" ? null : Number(text) });
        if (!parsed.success) {
          setError(`Enter a height from ${HEIGHT_CM_RANGE.min} to ${HEIGHT_CM_RANGE.max} cm, or leave the field empty.`);
          return;
        }
        setError(null);
        mutation.mutate(parsed.data, {
          onSuccess: () => setSaved(true),
          onError: (err) => setError(err instanceof ApiError ? err.message : "the height could not be saved; try again"),
        });
      }}
    >
      <div className="w-44">
        <TextField
          label="Height (cm)"
          inputMode="decimal"
          value={value}
          onChange={(e) => setValue(e.target.value)}
          error={error}
          hint={`${HEIGHT_CM_RANGE.min}–${HEIGHT_CM_RANGE.max} cm`}
        />
      </div>
      <Button type="submit" variant="secondary" busy={mutation.isPending}>
        Save height
      </Button>
      {saved ? (
        <div className="flex basis-full flex-wrap items-center gap-3">
          <FormMessage tone="success">
            Height saved.{n > 0 ? ` The ${n === 1 ? "session analysed before keeps its" : `${n} sessions analysed before keep their`} results until reprocessed.` : ""}
          </FormMessage>
          {n > 0 && !reprocess.isSuccess ? (
            <Button variant="secondary" busy={reprocess.isPending} onClick={() => reprocess.mutate(processedSessionIds)}>
              {n === 1 ? "Reprocess it with this height" : `Reprocess the ${n} sessions with this height`}
            </Button>
          ) : null}
          {reprocess.isSuccess ? <FormMessage tone="success">{`${reprocess.data === 1 ? "1 session" : `${reprocess.data} sessions`} queued; the values update when processing ends.`}</FormMessage> : null}
          {reprocess.isError ? <FormMessage tone="error">Reprocessing could not be started for every session; try again.</FormMessage> : null}
        </div>
      ) : null}
    </form>
  );
}
