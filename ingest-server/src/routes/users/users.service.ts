import type { Request } from "express";
import type { AppDeps } from "../../deps";
import type { ListUsersFilter, UpdateUserRequest, UserSummary } from "../../contracts/users";
import { audit } from "../../audit/audit";
import type { AuthContext } from "../../middleware/authenticate";
import { HttpError, notFound } from "../../http-error";
import { authRepository } from "../auth/auth.repository";
import { toUserSummary, usersRepository as repo } from "./users.repository";

export async function listUsers({ db }: AppDeps, q: ListUsersFilter) {
  return { ...(await repo.list(db, q)), limit: q.limit, offset: q.offset };
}

export async function getUser({ db }: AppDeps, id: string): Promise<UserSummary> {
  const row = await repo.get(db, id);
  if (!row) throw notFound("user");
  return toUserSummary(row);
}

export async function updateUser({ db }: AppDeps, actor: AuthContext, id: string, change: UpdateUserRequest, req: Request): Promise<UserSummary> {
  return db.transaction(async (trx) => {
    const before = await repo.lockForChange(trx, id);
    if (!before) throw notFound("user");
    if (change.role && change.role !== before.role && (change.role === "patient" || before.role === "patient")) {
      // A patient account is tied to its patient record (users_patient_link); moving in or out
      // of it would orphan clinical data, so those accounts are made by invitation instead.
      throw new HttpError(422, "role_change_unsupported", "an account cannot change to or from the patient role; invite a new account instead");
    }
    if (change.status === "active" && before.status === "invited") {
      throw new HttpError(422, "not_accepted", "an invited account becomes active when its invitation is accepted");
    }
    const losesAdmin =
      before.role === "admin" && before.status === "active" &&
      ((change.role && change.role !== "admin") || change.status === "disabled");
    if (losesAdmin && id === actor.userId) {
      throw new HttpError(409, "self_lockout", "you cannot remove your own admin access; ask another admin");
    }
    if (losesAdmin && (await repo.countActiveAdmins(trx)) <= 1) {
      throw new HttpError(409, "last_admin", "this is the last active admin");
    }
    const patch = {
      ...(change.role ? { role: change.role } : {}),
      ...(change.status ? { status: change.status } : {}),
      ...(change.displayName ? { display_name: change.displayName } : {}),
    };
    const after = await repo.update(trx, id, patch);
    if (!after) throw notFound("user");
    // A disabled account or a new role ends every session (access tokens fail the status/role check).
    if (after.status === "disabled" || after.role !== before.role) {
      await authRepository.revokeAllRefreshTokens(trx, id);
    }
    const changed: Record<string, { from: unknown; to: unknown }> = {};
    if (change.role && change.role !== before.role) changed.role = { from: before.role, to: after.role };
    if (change.status && change.status !== before.status) changed.status = { from: before.status, to: after.status };
    if (change.displayName && change.displayName !== before.display_name) changed.displayName = { from: before.display_name, to: after.display_name };
    await audit(trx, req, { action: "user.update", resourceType: "user", resourceId: id, patientId: after.patient_id, details: { changed } });
    return toUserSummary(after);
  });
}
