export function Spinner({ size = "md", label = "Loading" }: { size?: "sm" | "md" | "lg"; label?: string }) {
  const px = size === "sm" ? 14 : size === "lg" ? 32 : 20;
  return (
    <span role={label ? "status" : undefined} className="inline-flex items-center gap-2">
      <svg width={px} height={px} viewBox="0 0 20 20" aria-hidden="true" className="animate-spin">
        <circle cx="10" cy="10" r="7.5" fill="none" stroke="currentColor" strokeOpacity="0.22" strokeWidth="2.5" />
        <path d="M10 2.5a7.5 7.5 0 017.5 7.5" fill="none" stroke="currentColor" strokeWidth="2.5" strokeLinecap="round" />
      </svg>
      {label ? <span className="sr-only">{label}</span> : null}
    </span>
  );
}

export function LoadingState({ label = "Loading…" }: { label?: string }) {
  return (
    <div role="status" aria-live="polite" className="flex min-h-40 items-center justify-center gap-3 text-ink-soft">
      <Spinner label="" />
      <span>{label}</span>
    </div>
  );
}
