import type { ReactNode } from "react";
import { IconAlert, IconInfo } from "@/components/icons";
import { describeError } from "@/lib/api-error";
import { Button } from "./button";

export function EmptyState({ title, children, action }: { title: string; children?: ReactNode; action?: ReactNode }) {
  return (
    <div className="card flex flex-col items-start gap-2 p-6 sm:p-8">
      <span className="flex items-center gap-2 text-lg font-semibold text-ink">
        <IconInfo className="text-sky-deep" />
        {title}
      </span>
      {children ? <div className="max-w-prose text-ink-soft">{children}</div> : null}
      {action ? <div className="mt-2">{action}</div> : null}
    </div>
  );
}

export function ErrorState({
  title = "This could not be loaded",
  error,
  onRetry,
}: {
  title?: string;
  error?: unknown;
  onRetry?: () => void;
}) {
  return (
    <div role="alert" className="card flex flex-col items-start gap-2 border-clay p-6 sm:p-8">
      <span className="flex items-center gap-2 text-lg font-semibold text-clay-deep">
        <IconAlert />
        {title}
      </span>
      {error !== undefined ? <p className="max-w-prose text-ink-soft">{describeError(error)}</p> : null}
      {onRetry ? (
        <Button variant="secondary" onClick={onRetry} className="mt-2">
          Try again
        </Button>
      ) : null}
    </div>
  );
}
