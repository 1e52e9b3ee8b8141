import { useState } from "react";
import { Button, FormMessage, SelectField } from "@/components/ui";
import { ApiError } from "@/lib/api-client";
import { sessionUpdate, useReprocessSession, useUpdateSession } from "../api/session";
import { WALKING_AID_LABEL, WALKING_AIDS } from "@/lib/walking-aid";

/** The clinician records which walking aid the person used in this test (an aid changes speed and arm swing). */
export function WalkingAidEditor({ sessionId, current, onSaved }: { sessionId: string; current: string | null | undefined; onSaved?: () => void }) {
  const [value, setValue] = useState<string>(current ?? "");
  const [error, setError] = useState<string | null>(null);
  const [saved, setSaved] = useState(false);
  const mutation = useUpdateSession(sessionId, onSaved);
  const reprocess = useReprocessSession(sessionId, onSaved);
  const unchanged = value === (current ?? "");

  return (
    <form
      className="no-print flex flex-wrap items-end gap-3"
      aria-label="Walking aid used in this test"
      onSubmit={(e) => {
        e.preventDefault();
        setSaved(false);
        const parsed = sessionUpdate.safeParse({ walkingAid: value === "" ? null : value });
        if (!parsed.success) {
          setError(parsed.error.issues[0]?.message ?? "choose a walking aid");
          return;
        }
        setError(null);
        mutation.mutate(parsed.data, {
          onSuccess: () => setSaved(true),
          onError: (err) => setError(err instanceof ApiError ? err.message : "the walking aid could not be saved; try again"),
        });
      }}
    >
      <div className="min-w-52">
        <SelectField label="Walking aid in this test" value={value} onChange={(e) => setValue(e.target.value)} error={error}>
          <option value="">Not recorded</option>
          {WALKING_AIDS.map((a) => (
            <option key={a} value={a}>
              {WALKING_AID_LABEL[a] ?? a}
            </option>
          ))}
        </SelectField>
      </div>
      <Button type="submit" variant="secondary" busy={mutation.isPending} disabled={unchanged}>
        Save walking aid
      </Button>
      {saved && unchanged ? (
        <>
          <FormMessage tone="success">Walking aid saved. The numbers below were analysed before; reprocess to analyse the walk with it.</FormMessage>
          <Button variant="quiet" size="sm" busy={reprocess.isPending} onClick={() => reprocess.mutate(undefined, { onSuccess: () => setSaved(false) })}>
            Reprocess this session
          </Button>
        </>
      ) : null}
      {reprocess.isError ? <FormMessage tone="error">Reprocessing could not be started; try again.</FormMessage> : null}
    </form>
  );
}
