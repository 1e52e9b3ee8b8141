import { WALKING_AIDS } from "@pendula/ingest-server/contracts";

/** Words for the walking aids the clinician records per session (server enum in db/src/enums.ts). */
export const WALKING_AID_LABEL: Record<(typeof WALKING_AIDS)[number], string> = {
  none: "No aid",
  cane: "Cane",
  crutches: "Crutches",
  rollator: "Rollator",
  other: "Other aid",
};

export { WALKING_AIDS };

export const walkingAidLabel = (aid: string | null | undefined): string =>
  aid ? (WALKING_AID_LABEL[aid as keyof typeof WALKING_AID_LABEL] ?? aid) : "not recorded";
