import { queryOptions, useQuery } from "@tanstack/react-query";
import { mailboxResponse, type MailboxResponse } from "@pendula/ingest-server/contracts";
import { api } from "@/lib/api-client";

export type CapturedMessage = MailboxResponse["messages"][number];

export const mailboxKeys = { all: ["admin-mailbox"] as const, messages: () => [...mailboxKeys.all, "messages"] as const };

export function getMailbox(signal?: AbortSignal): Promise<CapturedMessage[]> {
  return api.get("/dev/mailbox", { schema: mailboxResponse, signal }).then((r) => r.messages);
}

export function mailboxQueryOptions() {
  return queryOptions({
    queryKey: mailboxKeys.messages(),
    queryFn: ({ signal }) => getMailbox(signal),
    select: (rows: CapturedMessage[]) => [...rows].sort((a, b) => b.receivedAt.localeCompare(a.receivedAt)),
  });
}

export function useMailbox() {
  // A new invitation appears without reloading while the admin waits for it.
  return useQuery({ ...mailboxQueryOptions(), refetchInterval: 5000 });
}
