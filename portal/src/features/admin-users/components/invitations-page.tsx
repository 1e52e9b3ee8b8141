import { useState } from "react";
import { Badge, EmptyState, ErrorState, LoadingState, PageHeader, SelectField, Table, Td, Th } from "@/components/ui";
import { useInvitations, type InvitationState, type InvitationSummary } from "../api/invitations";
import { InviteForm } from "./invite-form";
import { formatDateTime } from "@/lib/format";
import { roleLabel } from "@/lib/role-labels";

function stateOf(inv: InvitationSummary, now: number) {
  if (inv.acceptedAt) return <Badge tone="good">Accepted</Badge>;
  if (Date.parse(inv.expiresAt) <= now) return <Badge tone="caution">Expired</Badge>;
  return <Badge tone="info">Pending</Badge>;
}

const STATE_LABEL: Record<InvitationState, string> = { pending: "Pending", accepted: "Accepted", expired: "Expired", all: "All" };

export function InvitationsPage() {
  const [state, setState] = useState<InvitationState>("pending");
  const invitations = useInvitations(state);
  const now = Date.now();
  return (
    <div className="grid gap-6">
      <PageHeader eyebrow="Administration" title="Invitations">
        Invite clinicians, researchers, administrators and patients. In the demo, the e-mails land in the development
        mailbox.
      </PageHeader>
      <InviteForm />
      <section aria-labelledby="invitations-list-heading" className="grid gap-3">
        <div className="flex flex-wrap items-end justify-between gap-4">
          <h2 id="invitations-list-heading" className="text-lg font-bold text-ink">
            {STATE_LABEL[state]} invitations
          </h2>
          <div className="w-48">
            <SelectField label="Show" value={state} onChange={(e) => setState(e.target.value as InvitationState)}>
              {(Object.keys(STATE_LABEL) as InvitationState[]).map((s) => (
                <option key={s} value={s}>
                  {STATE_LABEL[s]}
                </option>
              ))}
            </SelectField>
          </div>
        </div>
        {invitations.isPending ? (
          <LoadingState label="Loading invitations…" />
        ) : invitations.isError ? (
          <ErrorState title="The invitations could not be loaded" error={invitations.error} onRetry={() => void invitations.refetch()} />
        ) : invitations.data.length === 0 ? (
          <EmptyState title={`No ${STATE_LABEL[state].toLowerCase()} invitations`}>
            {state === "pending" ? "Everyone invited so far has accepted, or no one has been invited yet." : "Nothing to show for this filter."}
          </EmptyState>
        ) : (
          <Table caption="Newest first">
            <thead>
              <tr>
                <Th>Name</Th>
                <Th>E-mail</Th>
                <Th>Role</Th>
                <Th>State</Th>
                <Th>Sent</Th>
                <Th>Expires</Th>
              </tr>
            </thead>
            <tbody>
              {invitations.data.map((inv) => (
                <tr key={inv.id}>
                  <Td className="font-semibold">{inv.displayName}</Td>
                  <Td className="whitespace-nowrap">{inv.email}</Td>
                  <Td>{roleLabel(inv.role)}</Td>
                  <Td>{stateOf(inv, now)}</Td>
                  <Td className="whitespace-nowrap tabular text-xs">{formatDateTime(inv.createdAt)}</Td>
                  <Td className="whitespace-nowrap tabular text-xs">{formatDateTime(inv.expiresAt)}</Td>
                </tr>
              ))}
            </tbody>
          </Table>
        )}
      </section>
    </div>
  );
}
