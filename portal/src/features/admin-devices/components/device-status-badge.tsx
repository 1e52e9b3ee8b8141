import { Badge, type BadgeTone } from "@/components/ui";

const STATUS: Record<string, { tone: BadgeTone; label: string }> = {
  in_stock: { tone: "info", label: "In stock" },
  assigned: { tone: "good", label: "Assigned" },
  maintenance: { tone: "caution", label: "In maintenance" },
  retired: { tone: "neutral", label: "Retired" },
};

export function deviceStatusLabel(status: string): string {
  return STATUS[status]?.label ?? status;
}

export function DeviceStatusBadge({ status }: { status: string }) {
  const s = STATUS[status] ?? { tone: "neutral" as const, label: status };
  return <Badge tone={s.tone}>{s.label}</Badge>;
}
