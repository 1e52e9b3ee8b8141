import { useState } from "react";
import { Link, useRouteLoaderData } from "react-router-dom";
import { ROLES, USER_STATUSES } from "@pendula/ingest-server/contracts";
import { Badge, Button, EmptyState, ErrorState, LoadingState, PageHeader, SelectField, Table, Td, TextField, Th } from "@/components/ui";
import { USER_PAGE_SIZE, useUsers, type UserFilters } from "../api/users";
import { formatDateTime } from "@/lib/format";
import { ROLE_LABEL, roleLabel } from "@/lib/role-labels";
import { STATUS_BADGE } from "./labels";
import { SecondFactorReset } from "./second-factor-reset";
import { UserRowEditor } from "./user-row-editor";

type Role = (typeof ROLES)[number];
type Status = (typeof USER_STATUSES)[number];

export function UsersPage() {
  // The signed-in account, from the shell's guard loader (features do not import each other).
  const me = useRouteLoaderData("signed-in") as { id?: string } | undefined;
  const [role, setRole] = useState<Role | "">("");
  const [status, setStatus] = useState<Status | "">("");
  const [search, setSearch] = useState("");
  const [offset, setOffset] = useState(0);
  const filters: UserFilters = {
    role: role || undefined,
    status: status || undefined,
    q: search.trim() || undefined,
    limit: USER_PAGE_SIZE,
    offset,
  };
  const users = useUsers(filters);

  return (
    <div>
      <PageHeader
        eyebrow="Administration"
        title="Users"
        actions={
          <Link to="/admin/invitations" className="rounded-lg border border-line bg-paper px-4 py-2 font-semibold text-ink hover:bg-sand-deep">
            Invite someone
          </Link>
        }
      >
        Accounts of every role. Change a staff member's role, or disable an account to end its access at once.
      </PageHeader>

      <div className="mb-4 grid max-w-3xl gap-4 sm:grid-cols-3" role="search" aria-label="Filter users">
        <TextField
          label="Search"
          hint="Name or e-mail"
          type="search"
          value={search}
          onChange={(e) => {
            setSearch(e.target.value);
            setOffset(0);
          }}
        />
        <SelectField
          label="Role"
          value={role}
          onChange={(e) => {
            setRole(e.target.value as Role | "");
            setOffset(0);
          }}
        >
          <option value="">All roles</option>
          {ROLES.map((r) => (
            <option key={r} value={r}>
              {ROLE_LABEL[r]}
            </option>
          ))}
        </SelectField>
        <SelectField
          label="Status"
          value={status}
          onChange={(e) => {
            setStatus(e.target.value as Status | "");
            setOffset(0);
          }}
        >
          <option value="">All statuses</option>
          {USER_STATUSES.map((s) => (
            <option key={s} value={s}>
              {STATUS_BADGE[s]?.label ?? s}
            </option>
          ))}
        </SelectField>
      </div>

      {users.isPending ? (
        <LoadingState label="Loading users…" />
      ) : users.isError ? (
        <ErrorState title="The users could not be loaded" error={users.error} onRetry={() => void users.refetch()} />
      ) : users.data.items.length === 0 ? (
        <EmptyState title="No accounts match">Clear the search or the filters to see every account.</EmptyState>
      ) : (
        <div className="grid gap-3">
          <Table caption={`Accounts ${users.data.offset + 1}–${users.data.offset + users.data.items.length} of ${users.data.total}`}>
            <thead>
              <tr>
                <Th>Name</Th>
                <Th>E-mail</Th>
                <Th>Role</Th>
                <Th>Status</Th>
                <Th>Last sign-in</Th>
                <Th>Change</Th>
              </tr>
            </thead>
            <tbody>
              {users.data.items.map((u) => (
                <tr key={u.id}>
                  <Td className="font-semibold">{u.displayName}</Td>
                  <Td className="whitespace-nowrap">{u.email}</Td>
                  <Td>{roleLabel(u.role)}</Td>
                  <Td>
                    <Badge tone={STATUS_BADGE[u.status]?.tone ?? "neutral"}>{STATUS_BADGE[u.status]?.label ?? u.status}</Badge>
                  </Td>
                  <Td className="whitespace-nowrap tabular text-xs">{formatDateTime(u.lastLoginAt, { missing: "never" })}</Td>
                  <Td>
                    <UserRowEditor key={`${u.id}-${u.role}-${u.status}`} user={u} isSelf={me?.id === u.id} />
                    {me?.id === u.id || u.status !== "active" ? null : <SecondFactorReset userId={u.id} displayName={u.displayName} />}
                  </Td>
                </tr>
              ))}
            </tbody>
          </Table>
          <Pager total={users.data.total} offset={users.data.offset} limit={users.data.limit} onOffset={setOffset} busy={users.isFetching} />
        </div>
      )}
    </div>
  );
}

function Pager({ total, offset, limit, onOffset, busy }: { total: number; offset: number; limit: number; onOffset: (o: number) => void; busy: boolean }) {
  const pageNo = Math.floor(offset / limit) + 1;
  const pages = Math.max(1, Math.ceil(total / limit));
  return (
    <nav aria-label="Pages of users" className="flex items-center gap-3">
      <Button variant="secondary" size="sm" disabled={offset === 0 || busy} onClick={() => onOffset(Math.max(0, offset - limit))}>
        ← Previous
      </Button>
      <span className="text-sm text-ink-soft" aria-live="polite">
        Page {pageNo} of {pages}
      </span>
      <Button variant="secondary" size="sm" disabled={offset + limit >= total || busy} onClick={() => onOffset(offset + limit)}>
        Next →
      </Button>
    </nav>
  );
}
