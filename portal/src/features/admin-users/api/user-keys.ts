import type { UserFilters } from "./users";

export const userKeys = {
  all: ["admin-users"] as const,
  lists: () => [...userKeys.all, "list"] as const,
  list: (filters: UserFilters) => [...userKeys.lists(), filters] as const,
  invitations: (state: string) => [...userKeys.all, "invitations", state] as const,
  patientRecords: () => [...userKeys.all, "patient-records"] as const,
};
