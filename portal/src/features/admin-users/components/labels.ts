import type { BadgeTone } from "@/components/ui";

export const ROLE_LABEL: Record<string, string> = {
  patient: "Patient",
  clinician: "Clinician",
  researcher: "Researcher",
  admin: "Administrator",
};

export const STATUS_BADGE: Record<string, { tone: BadgeTone; label: string }> = {
  active: { tone: "good", label: "Active" },
  invited: { tone: "info", label: "Invited" },
  disabled: { tone: "alert", label: "Disabled" },
};

export function formatWhen(iso: string | null): string {
  if (!iso) return "never";
  const d = new Date(iso);
  return d.toLocaleString("en-GB", { year: "numeric", month: "short", day: "numeric", hour: "2-digit", minute: "2-digit" });
}
