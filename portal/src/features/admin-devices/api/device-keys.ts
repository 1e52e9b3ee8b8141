/** Hierarchical keys: an assignment change invalidates `all`, refreshing the inventory and every history. */
export const deviceKeys = {
  all: ["admin-devices"] as const,
  lists: () => [...deviceKeys.all, "list"] as const,
  assignments: (deviceId: string) => [...deviceKeys.all, "assignments", deviceId] as const,
  patients: () => [...deviceKeys.all, "patients"] as const,
};
