import { PLACEMENTS } from "@pendula/ingest-server/contracts";

/** Where a sensor is worn (server enum in db/src/enums.ts). */
export type Placement = (typeof PLACEMENTS)[number];

/**
 * Words for the care team and administrators. A Record over the server's enumeration, so a new
 * placement fails the type check until it has its words here.
 */
export const PLACEMENT_LABEL: Record<Placement, string> = {
  left_shank: "Left shank",
  right_shank: "Right shank",
  left_wrist: "Left wrist",
  right_wrist: "Right wrist",
  left_foot: "Left foot",
  right_foot: "Right foot",
  lower_back: "Lower back",
};

/** Words for patients: everyday names for the body parts, lower case for use inside a sentence. */
export const PLACEMENT_PLAIN_WORDS: Record<Placement, string> = {
  left_shank: "left lower leg",
  right_shank: "right lower leg",
  left_wrist: "left wrist",
  right_wrist: "right wrist",
  left_foot: "left foot",
  right_foot: "right foot",
  lower_back: "lower back",
};

/** The four placements of the weekly home test first, then the others the hardware supports. */
export const PLACEMENT_OPTIONS: readonly { value: Placement; label: string }[] = PLACEMENTS.map((value) => ({ value, label: PLACEMENT_LABEL[value] }));

const isPlacement = (value: string): value is Placement => Object.hasOwn(PLACEMENT_LABEL, value);

/** The care team's words for a placement; a value this build does not know is shown as it came. */
export function placementLabel(value: string): string {
  return isPlacement(value) ? PLACEMENT_LABEL[value] : value;
}

/** The patient's words for a placement ("left lower leg"); unknown values lose their underscores. */
export function placementWords(value: string | null | undefined): string {
  if (!value) return "unknown position";
  return isPlacement(value) ? PLACEMENT_PLAIN_WORDS[value] : value.replace(/_/g, " ");
}
