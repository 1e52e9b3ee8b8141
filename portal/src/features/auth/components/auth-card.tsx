import type { ReactNode } from "react";

export function AuthCard({ title, intro, children, footer }: { title: string; intro?: ReactNode; children: ReactNode; footer?: ReactNode }) {
  return (
    <div className="card w-full max-w-md p-6 sm:p-8">
      <h1 className="text-2xl font-bold text-ink">{title}</h1>
      {intro ? <div className="mt-1.5 text-ink-soft">{intro}</div> : null}
      <div className="mt-6">{children}</div>
      {footer ? <div className="mt-6 border-t border-line pt-4 text-sm text-ink-soft">{footer}</div> : null}
    </div>
  );
}
