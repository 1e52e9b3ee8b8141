import { randomBytes } from "node:crypto";
import type { Request } from "express";
import type { z } from "zod";
import type { AppDeps } from "../../deps";
import type { createInvitationRequest, CreateInvitationResponse, InvitationSummary } from "../../contracts/invitations";
import { audit } from "../../audit/audit";
import { newOpaqueToken } from "../../auth/opaque-token";
import { assertPatientAccess } from "../../auth/patient-access";
import type { AuthContext } from "../../middleware/authenticate";
import { HttpError } from "../../http-error";
import { openCaseloadLink } from "../caseload-links/caseload-links.service";
import { recordConsentAtEnrolment } from "../consent/consent.service";
import { invitationsRepository as repo, toInvitationSummary } from "./invitations.repository";

type CreateInvitation = z.output<typeof createInvitationRequest>;
const DAY_MS = 86_400_000;

/**
 * Admins invite any role; a clinician invites patients only. An invitation never changes who
 * can read a patient's data, with one exception: a clinician who enrols a new patient by
 * inviting them gets that patient on their caseload, recorded as a caseload link of its own.
 * Re-inviting an account still waiting for its first sign-in issues a new link and retires the
 * old one; an account that has signed in is never re-invited.
 */
export async function createInvitation({ db, config, mailer }: AppDeps, actor: AuthContext, input: CreateInvitation, req: Request): Promise<CreateInvitationResponse> {
  if (actor.role === "clinician" && input.role !== "patient") {
    throw new HttpError(403, "forbidden", "clinicians can invite patients only");
  }
  if (input.clinicianIds?.length) {
    throw new HttpError(
      422,
      "use_caseload_links",
      "an invitation does not give clinicians access; add caseload links explicitly (POST /api/caseload-links) with a reason",
    );
  }
  const token = newOpaqueToken();
  const expiresAt = new Date(Date.now() + config.invitationTtlDays * DAY_MS);

  const summary = await db.transaction(async (trx) => {
    const existing = await repo.findUserByEmail(trx, input.email);
    let userId: string;
    let patientId: string | null = null;
    if (existing) {
      if (existing.status === "active") {
        throw new HttpError(409, "account_active", "this person already has an active account: they sign in, or reset their password, instead of a new invitation");
      }
      if (existing.status !== "invited") throw new HttpError(409, "account_disabled", "this account is disabled: enable it on the Users page instead of inviting it again");
      if (existing.role !== input.role) {
        throw new HttpError(409, "email_taken", `this e-mail is already invited as ${existing.role}`);
      }
      if (existing.patient_id) {
        // A clinician may re-invite only a patient already on their caseload.
        if (actor.role === "clinician") {
          await assertPatientAccess(trx, actor, existing.patient_id, "clinical").catch(() => {
            throw new HttpError(409, "email_taken", "an account with this e-mail already exists");
          });
        }
        patientId = existing.patient_id;
      }
      userId = existing.id;
      await repo.closeOpenInvitations(trx, userId);
    } else {
      if (input.role === "patient") {
        if (input.patientId) {
          await assertPatientAccess(trx, actor, input.patientId, actor.role === "admin" ? "identity" : "clinical");
          if (await repo.patientHasAccount(trx, input.patientId)) throw new HttpError(409, "patient_has_account", "this patient already has an account");
          patientId = input.patientId;
        } else if (input.patient) {
          const p = input.patient;
          patientId = await repo.insertPatient(trx, {
            display_name: input.displayName,
            research_id: `S-${randomBytes(6).toString("hex")}`,
            birth_year: p.birthYear,
            sex: p.sex,
            condition: p.condition,
            condition_detail: p.conditionDetail ?? null,
            enrolled_on: p.enrolledOn,
            research_consent: false,
            expected_uploads_per_week: p.expectedUploadsPerWeek,
          });
          if (p.researchConsent) await recordConsentAtEnrolment(db, trx, req, actor, patientId, p.researchConsentReason);
        }
      }
      userId = await repo.insertUser(trx, {
        email: input.email,
        display_name: input.displayName,
        role: input.role,
        patient_id: patientId,
      });
    }
    if (actor.role === "clinician" && !existing && input.patient && patientId) {
      await openCaseloadLink(trx, req, actor, { clinicianId: actor.userId, patientId, reason: "enrolled by this clinician's invitation" });
    }
    const invitationId = await repo.insertInvitation(trx, {
      user_id: userId,
      token_sha256: token.sha256,
      invited_by: actor.userId,
      expires_at: expiresAt,
    });
    await audit(trx, req, {
      action: "invitation.create",
      resourceType: "invitation",
      resourceId: invitationId,
      patientId,
      details: { role: input.role, userId, reissued: Boolean(existing) },
    });
    const row = await repo.get(trx, invitationId);
    return toInvitationSummary(row!);
  });

  const link = `${config.publicUrl}/accept-invitation?token=${token.token}`;
  let emailSent = false;
  try {
    ({ sent: emailSent } = await mailer.send({
      to: summary.email,
      kind: "invitation",
      idempotencyKey: `invitation:${summary.id}`,
      subject: "You are invited to Pendula",
      text:
        `Hello ${summary.displayName},\n\nYou have been invited to Pendula as ${summary.role}. ` +
        `Open this link to choose your password (it works once and expires on ${summary.expiresAt.slice(0, 10)}):\n\n${link}\n\n` +
        `If you did not expect this invitation, you can ignore this message.\n`,
    }));
  } catch (err) {
    console.error("[mail] invitation not sent:", err);
  }
  return { ...summary, emailSent };
}

export async function listInvitations({ db }: AppDeps, actor: AuthContext, state: "pending" | "accepted" | "expired" | "all"): Promise<InvitationSummary[]> {
  const rows = await repo.list(db, { state, ...(actor.role === "admin" ? {} : { invitedBy: actor.userId }) });
  return rows.map(toInvitationSummary);
}
