import { PLACEMENTS, type Placement } from "../types";

/**
 * Names accepted for each placement, compared after lower-casing and removing spaces, `_`, `-`
 * and `.`: so `LeftShank`, `left_shank`, `left-shank` and `Left Shank` are all `left_shank`.
 * BIDS Motion leaves `tracked_point` free text; these are the labels Pendula understands
 * (documented in signal/README.md).
 */
export const TRACKED_POINT_ALIASES: Readonly<Record<Placement, readonly string[]>> = {
  left_shank: ["leftshank", "lshank", "shankleft", "leftshin", "leftlowerleg"],
  right_shank: ["rightshank", "rshank", "shankright", "rightshin", "rightlowerleg"],
  left_wrist: ["leftwrist", "lwrist", "wristleft", "leftforearm"],
  right_wrist: ["rightwrist", "rwrist", "wristright", "rightforearm"],
  left_foot: ["leftfoot", "lfoot", "footleft"],
  right_foot: ["rightfoot", "rfoot", "footright"],
  lower_back: ["lowerback", "lumbar", "pelvis", "sacrum", "l5", "waist"],
};

const LOOKUP = new Map<string, Placement>();
for (const placement of PLACEMENTS) {
  for (const alias of TRACKED_POINT_ALIASES[placement]) LOOKUP.set(alias, placement);
}

export function normalizeLabel(label: string): string {
  return label.toLowerCase().replace(/[\s_\-.]+/g, "");
}

/** The placement for a tracked-point or header label, or null when the label is not in the table. */
export function placementFromLabel(label: string): Placement | null {
  return LOOKUP.get(normalizeLabel(label)) ?? null;
}
