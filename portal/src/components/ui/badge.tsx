import type { ReactNode } from "react";
import { IconAlert, IconCheck, IconInfo, IconSteady, IconStop } from "@/components/icons";

export type BadgeTone = "neutral" | "good" | "caution" | "alert" | "info";

const TONES: Record<BadgeTone, { cls: string; icon: ReactNode }> = {
  neutral: { cls: "bg-sand-deep text-ink border-line", icon: <IconSteady /> },
  good: { cls: "bg-moss-wash text-moss-deep border-moss/30", icon: <IconCheck /> },
  caution: { cls: "bg-ochre-wash text-ochre border-ochre/30", icon: <IconAlert /> },
  alert: { cls: "bg-clay-wash text-clay-deep border-clay/40", icon: <IconStop /> },
  info: { cls: "bg-sky-wash text-sky-deep border-sky/30", icon: <IconInfo /> },
};

/** A status label: always an icon and a word, so colour is never the only signal. */
export function Badge({ tone = "neutral", icon, children }: { tone?: BadgeTone; icon?: ReactNode; children: ReactNode }) {
  const t = TONES[tone];
  return (
    <span className={`inline-flex items-center gap-1 whitespace-nowrap rounded-full border px-2 py-0.5 text-xs font-semibold ${t.cls}`}>
      {icon ?? t.icon}
      <span>{children}</span>
    </span>
  );
}
