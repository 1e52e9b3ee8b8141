import { useState, type FormEvent } from "react";
import { Button } from "@/components/ui";
import { describeError } from "@/lib/api-error";
import { resetSecondFactorSchema, useResetSecondFactor } from "../api/reset-second-factor";

/**
 * An administrator removes someone's authenticator app (a lost or replaced phone). The person is
 * signed out everywhere and sets up a new app at their next sign-in; the reason goes to the audit
 * log. Opened on demand, so the users table stays a table.
 */
export function SecondFactorReset({ userId, displayName }: { userId: string; displayName: string }) {
  const [open, setOpen] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  const reset = useResetSecondFactor();

  if (!open) {
    return (
      <button type="button" className="text-xs font-semibold text-sky-deep underline underline-offset-2" onClick={() => setOpen(true)}>
        Reset authenticator app…
      </button>
    );
  }
  if (reset.isSuccess) {
    return (
      <p role="status" className="text-xs font-semibold text-moss-deep">
        ✓ Authenticator removed; {reset.data.endedSessions} session(s) ended. {displayName} sets up a new app at the next sign-in.
      </p>
    );
  }

  function submit(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const parsed = resetSecondFactorSchema.safeParse({ reason: new FormData(e.currentTarget).get("reason") ?? "" });
    if (!parsed.success) return setProblem(parsed.error.issues[0]?.message ?? "give a reason");
    setProblem(null);
    reset.mutate({ userId, input: parsed.data });
  }

  return (
    <form onSubmit={submit} noValidate className="flex flex-col gap-1.5 rounded-md border border-line bg-sand-deep/50 p-2" aria-label={`Reset the authenticator app of ${displayName}`}>
      <label className="flex flex-col gap-1 text-xs font-semibold text-ink">
        Reason (kept in the audit log)
        <input name="reason" className="rounded-md border border-line bg-paper px-2 py-1 text-sm font-normal" placeholder="e.g. phone replaced; identity checked in person" />
      </label>
      <p className="text-xs text-ink-soft">Check the person's identity first. They will be signed out everywhere.</p>
      <div className="flex gap-2">
        <Button type="submit" size="sm" variant="danger" busy={reset.isPending}>
          Reset
        </Button>
        <Button size="sm" variant="quiet" onClick={() => setOpen(false)}>
          Cancel
        </Button>
      </div>
      {problem ? <span className="text-xs font-semibold text-ochre">{problem}</span> : null}
      {reset.isError ? (
        <span role="alert" className="text-xs font-semibold text-clay-deep">
          <span aria-hidden="true">⚠ </span>
          {describeError(reset.error)}
        </span>
      ) : null}
    </form>
  );
}
