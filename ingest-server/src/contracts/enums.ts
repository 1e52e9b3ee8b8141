// The database's enumerations, re-exported for the contracts. The relative path (not "@pendula/db")
// keeps the portal bundle free of knex: enums.ts imports nothing.
export {
  ROLES,
  USER_STATUSES,
  SEXES,
  CONDITIONS,
  DEVICE_KINDS,
  DEVICE_STATUSES,
  PLACEMENTS,
  SESSION_STATUSES,
  FILE_FORMATS,
  TRAINING_KINDS,
  WALKING_AIDS,
} from "../../../db/src/enums";
export type { Role, Condition, SessionStatus, WalkingAid } from "../../../db/src/enums";
