import { forwardRef, type ButtonHTMLAttributes, type ReactNode } from "react";
import { Spinner } from "./spinner";

type Variant = "primary" | "secondary" | "quiet" | "danger";
type Size = "md" | "sm" | "lg";

const VARIANTS: Record<Variant, string> = {
  primary: "bg-moss text-white hover:bg-moss-deep border-transparent",
  secondary: "bg-paper text-ink border-line hover:bg-sand-deep",
  quiet: "bg-transparent text-ink-soft border-transparent hover:bg-sand-deep hover:text-ink",
  danger: "bg-clay-deep text-white border-transparent hover:bg-clay",
};
const SIZES: Record<Size, string> = {
  sm: "text-sm px-3 py-1.5 gap-1.5",
  md: "text-[0.95rem] px-4 py-2 gap-2",
  lg: "text-base px-5 py-3 gap-2.5",
};

export function buttonClasses(variant: Variant = "primary", size: Size = "md", extra = ""): string {
  return `inline-flex items-center justify-center rounded-lg border font-semibold transition-colors disabled:cursor-not-allowed disabled:opacity-55 ${VARIANTS[variant]} ${SIZES[size]} ${extra}`;
}

export interface ButtonProps extends ButtonHTMLAttributes<HTMLButtonElement> {
  variant?: Variant;
  size?: Size;
  icon?: ReactNode;
  /** Shows a spinner, disables the button and announces the busy state. */
  busy?: boolean;
}

export const Button = forwardRef<HTMLButtonElement, ButtonProps>(function Button(
  { variant = "primary", size = "md", icon, busy = false, className = "", children, disabled, type = "button", ...rest },
  ref,
) {
  return (
    <button
      ref={ref}
      type={type}
      className={buttonClasses(variant, size, className)}
      disabled={disabled || busy}
      aria-busy={busy || undefined}
      {...rest}
    >
      {busy ? <Spinner size="sm" label="" /> : icon}
      {children}
    </button>
  );
});
