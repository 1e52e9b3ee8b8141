import type { AppDeps } from "../../deps";
import { HttpError } from "../../http-error";
import type { AuthContext } from "../../middleware/authenticate";
import { usersRepository } from "../users/users.repository";

/** The signed-in account as the portal needs it; a token of a deleted account is refused. */
export async function getMe(deps: AppDeps, auth: AuthContext) {
  const user = await usersRepository.get(deps.db, auth.userId);
  if (!user) throw new HttpError(401, "invalid_token", "account no longer exists");
  return {
    id: user.id,
    email: user.email,
    role: user.role,
    displayName: user.display_name,
    ...(user.patient_id ? { patientId: user.patient_id } : {}),
    scopes: auth.scopes,
  };
}
