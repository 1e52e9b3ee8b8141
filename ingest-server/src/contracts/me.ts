import { z } from "zod";
import { ROLES } from "./enums";

export const meResponse = z.strictObject({
  id: z.uuid(),
  email: z.string(),
  role: z.enum(ROLES),
  displayName: z.string(),
  patientId: z.uuid().optional(),
  scopes: z.array(z.string()),
});
export type MeResponse = z.infer<typeof meResponse>;
