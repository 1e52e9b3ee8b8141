import { z } from "zod";
import { isoDateTime, page, paging } from "./common";
import { ROLES, USER_STATUSES } from "./enums";

export const userSummary = z.strictObject({
  id: z.uuid(),
  email: z.string(),
  displayName: z.string(),
  role: z.enum(ROLES),
  status: z.enum(USER_STATUSES),
  patientId: z.uuid().nullable(),
  createdAt: isoDateTime,
  lastLoginAt: isoDateTime.nullable(),
});
export type UserSummary = z.infer<typeof userSummary>;

export const listUsersQuery = paging.extend({
  role: z.enum(ROLES).optional(),
  status: z.enum(USER_STATUSES).optional(),
  /** Case-insensitive match on e-mail or display name. */
  q: z.string().trim().min(1).max(100).optional(),
});
export type ListUsersQuery = z.input<typeof listUsersQuery>;
export type ListUsersFilter = z.output<typeof listUsersQuery>;

export const userPage = page(userSummary);
export type UserPage = z.infer<typeof userPage>;

export const updateUserRequest = z
  .object({
    role: z.enum(ROLES).optional(),
    status: z.enum(["active", "disabled"]).optional(),
    displayName: z.string().trim().min(1).max(120).optional(),
  })
  .refine((v) => v.role !== undefined || v.status !== undefined || v.displayName !== undefined, {
    error: "give at least one of role, status, displayName",
  });
export type UpdateUserRequest = z.input<typeof updateUserRequest>;
