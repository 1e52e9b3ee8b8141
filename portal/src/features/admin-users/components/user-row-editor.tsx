import { useState, type FormEvent } from "react";
import { Button } from "@/components/ui";
import { describeError } from "@/lib/api-error";
import { STAFF_ROLES, updateUserInputSchema, useUpdateUser } from "../api/update-user";
import type { UserSummary } from "../api/users";
import { ROLE_LABEL } from "@/lib/role-labels";

const SELECT = "rounded-md border border-line bg-paper px-2 py-1 text-sm text-ink";

/** Role and status controls for one account; saving sends only what changed. */
export function UserRowEditor({ user, isSelf }: { user: UserSummary; isSelf: boolean }) {
  const update = useUpdateUser();
  const [role, setRole] = useState<string>(user.role);
  const [status, setStatus] = useState<string>(user.status);
  const [problem, setProblem] = useState<string | null>(null);
  const staff = user.role !== "patient";
  const statusEditable = user.status !== "invited";

  function submit(event: FormEvent) {
    event.preventDefault();
    const parsed = updateUserInputSchema.safeParse({
      role: staff && role !== user.role ? role : undefined,
      status: statusEditable && status !== user.status ? status : undefined,
    });
    if (!parsed.success) return setProblem(parsed.error.issues[0]?.message ?? "nothing to save");
    setProblem(null);
    update.mutate({ id: user.id, input: parsed.data });
  }

  return (
    <form onSubmit={submit} className="flex min-w-max flex-wrap items-center gap-2" aria-label={`Change ${user.displayName}`}>
      {staff ? (
        <label className="flex items-center gap-1 text-xs font-semibold text-ink-soft">
          Role
          <select className={SELECT} value={role} onChange={(e) => setRole(e.target.value)} disabled={isSelf}>
            {STAFF_ROLES.map((r) => (
              <option key={r} value={r}>
                {ROLE_LABEL[r]}
              </option>
            ))}
          </select>
        </label>
      ) : null}
      {statusEditable ? (
        <label className="flex items-center gap-1 text-xs font-semibold text-ink-soft">
          Status
          <select className={SELECT} value={status} onChange={(e) => setStatus(e.target.value)} disabled={isSelf}>
            <option value="active">Active</option>
            <option value="disabled">Disabled</option>
          </select>
        </label>
      ) : (
        <span className="text-xs text-ink-soft">Awaiting acceptance</span>
      )}
      {isSelf ? (
        <span className="text-xs text-ink-soft">This is you</span>
      ) : (
        <Button type="submit" size="sm" variant="secondary" busy={update.isPending}>
          Save
        </Button>
      )}
      <span aria-live="polite" className="basis-full text-xs">
        {problem ? <span className="font-semibold text-ochre">{problem}</span> : null}
        {update.isError ? (
          <span role="alert" className="font-semibold text-clay-deep">
            <span aria-hidden="true">⚠ </span>
            {describeError(update.error)}
          </span>
        ) : null}
        {update.isSuccess ? <span className="font-semibold text-moss-deep">✓ Saved</span> : null}
      </span>
    </form>
  );
}
