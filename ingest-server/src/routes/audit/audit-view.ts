import { isClinicalDetailAction, type AuditEventView } from "../../contracts/audit";

type Stored = Omit<AuditEventView, "withheld">;

/**
 * The audit answer for an admin. A patient's network address and browser identify where and how
 * they live with the product and say nothing an admin needs to run it; training and walking-aid
 * details are care. Both stay in the stored row (for an investigation under local policy, read in
 * the database) and are left out here, with `withheld` naming what was left out.
 */
export function auditViewForAdmin(e: Stored, actorIsPatient: boolean): AuditEventView {
  const withheld: AuditEventView["withheld"] = [];
  let { ip, userAgent, details } = e;
  if (actorIsPatient) {
    if (ip !== null) withheld.push("ip");
    if (userAgent !== null) withheld.push("userAgent");
    ip = null;
    userAgent = null;
  }
  if (isClinicalDetailAction(e.action)) {
    if (details !== null) withheld.push("details");
    details = null;
  }
  return { ...e, ip, userAgent, details, withheld };
}
