// Enumerations enforced by CHECK constraints; the server's zod contracts import these so the
// database and the API can never disagree.
export const ROLES = ["patient", "clinician", "researcher", "admin"] as const;
export const USER_STATUSES = ["invited", "active", "disabled"] as const;
export const SEXES = ["female", "male", "other", "unknown"] as const;
export const CONDITIONS = ["incomplete_sci", "stroke", "parkinsons", "other"] as const;
export const DEVICE_KINDS = ["imu6", "imu9"] as const;
export const DEVICE_STATUSES = ["in_stock", "assigned", "maintenance", "retired"] as const;
export const PLACEMENTS = [
  "left_shank",
  "right_shank",
  "left_wrist",
  "right_wrist",
  "left_foot",
  "right_foot",
  "lower_back",
] as const;
export const SESSION_STATUSES = ["queued", "processing", "done", "failed"] as const;
export const FILE_FORMATS = ["pendula-csv-v1", "bids-motion"] as const;
/** Walking aid used during one home walking test (recorded by the clinician per session). */
export const WALKING_AIDS = ["none", "cane", "crutches", "rollator", "other"] as const;
export const TRAINING_KINDS = ["overground", "treadmill", "body_weight_support", "balance", "strength", "other"] as const;

export type Role = (typeof ROLES)[number];
export type Condition = (typeof CONDITIONS)[number];
export type SessionStatus = (typeof SESSION_STATUSES)[number];
export type WalkingAid = (typeof WALKING_AIDS)[number];
