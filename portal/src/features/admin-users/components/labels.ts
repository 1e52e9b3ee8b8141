import type { BadgeTone } from "@/components/ui";

export const STATUS_BADGE: Record<string, { tone: BadgeTone; label: string }> = {
  active: { tone: "good", label: "Active" },
  invited: { tone: "info", label: "Invited" },
  disabled: { tone: "alert", label: "Disabled" },
};
