import { PLACEMENTS } from "@pendula/ingest-server/contracts";

export type Placement = (typeof PLACEMENTS)[number];

const LABELS: Record<Placement, string> = {
  left_shank: "Left shank",
  right_shank: "Right shank",
  left_wrist: "Left wrist",
  right_wrist: "Right wrist",
  left_foot: "Left foot",
  right_foot: "Right foot",
  lower_back: "Lower back",
};

/** The four placements of the weekly home test first, then the others the hardware supports. */
export const PLACEMENT_OPTIONS = PLACEMENTS.map((value) => ({ value, label: LABELS[value] }));

export function placementLabel(value: string): string {
  return LABELS[value as Placement] ?? value;
}
