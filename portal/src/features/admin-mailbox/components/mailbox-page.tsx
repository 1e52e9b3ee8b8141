import { useState } from "react";
import { Badge, Button, EmptyState, ErrorState, LoadingState, PageHeader } from "@/components/ui";
import { formatDateTimeSeconds } from "@/lib/format";
import { useMailbox, type CapturedMessage } from "../api/mailbox";
import { inAppPath, splitLinks } from "../api/message-parts";

const LINK = "font-semibold text-sky-deep underline decoration-sky/50 underline-offset-2 break-all hover:decoration-sky-deep";

function MessageBody({ text }: { text: string }) {
  const origin = window.location.origin;
  return (
    <p className="whitespace-pre-wrap break-words text-sm leading-relaxed text-ink">
      {splitLinks(text, origin).map((part, i) =>
        part.kind === "text" ? (
          <span key={i}>{part.text}</span>
        ) : part.sameOrigin ? (
          <a key={i} href={part.href} className={LINK}>
            {part.href}
          </a>
        ) : (
          <span key={i}>
            <a key={i} href={part.href} className={LINK} rel="noopener noreferrer">
              {part.href}
            </a>{" "}
            <a href={inAppPath(part.href)} className="text-xs font-semibold text-moss-deep underline underline-offset-2">
              (open in this portal)
            </a>
          </span>
        ),
      )}
    </p>
  );
}

function MessageCard({ message, expanded, onToggle }: { message: CapturedMessage; expanded: boolean; onToggle: () => void }) {
  const bodyId = `mail-${message.id}`;
  const hasLink = /https?:\/\//.test(message.text);
  return (
    <li className="card p-4">
      <div className="flex flex-wrap items-start justify-between gap-3">
        <div className="min-w-0">
          <h2 className="text-base font-bold text-ink">{message.subject || "(no subject)"}</h2>
          <p className="text-sm text-ink-soft">
            To <span className="font-semibold text-ink">{message.to.join(", ")}</span> · from {message.from}
          </p>
          <p className="text-xs text-ink-faint tabular">
            <time dateTime={message.receivedAt}>{formatDateTimeSeconds(message.receivedAt)}</time>
          </p>
        </div>
        <div className="flex items-center gap-2">
          {hasLink ? <Badge tone="info">Has a link</Badge> : null}
          <Button variant="secondary" size="sm" aria-expanded={expanded} aria-controls={bodyId} onClick={onToggle}>
            {expanded ? "Hide message" : "Show message"}
          </Button>
        </div>
      </div>
      <div id={bodyId} hidden={!expanded} className="mt-3 border-t border-line pt-3">
        <MessageBody text={message.text} />
      </div>
    </li>
  );
}

export function MailboxPage() {
  const mailbox = useMailbox();
  const [open, setOpen] = useState<Set<string>>(new Set());
  const toggle = (id: string) =>
    setOpen((prev) => {
      const next = new Set(prev);
      if (next.has(id)) next.delete(id);
      else next.add(id);
      return next;
    });

  return (
    <div>
      <PageHeader eyebrow="Development" title="Mailbox">
        Messages the server sent to the local SMTP catcher instead of real inboxes. Follow an invitation or reset link
        here to try it by hand. Newest first; refreshes every few seconds.
      </PageHeader>
      {mailbox.isPending ? (
        <LoadingState label="Loading captured messages…" />
      ) : mailbox.isError ? (
        <ErrorState title="The mailbox could not be loaded" error={mailbox.error} onRetry={() => void mailbox.refetch()} />
      ) : mailbox.data.length === 0 ? (
        <EmptyState title="No messages captured yet">Send an invitation or a password reset and it will appear here.</EmptyState>
      ) : (
        // The newest message starts open: it is almost always the one being waited for.
        <ul className="grid gap-3" aria-label="Captured messages">
          {mailbox.data.map((m, i) => (
            <MessageCard
              key={m.id}
              message={m}
              expanded={open.has(m.id) !== (i === 0)}
              onToggle={() => toggle(m.id)}
            />
          ))}
        </ul>
      )}
    </div>
  );
}
