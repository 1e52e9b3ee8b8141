import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { assertPatientAccess } from "../patient-access";
import { scopesFor } from "../scopes";
import type { Role } from "../../contracts/enums";
import { createTestContext, type SeededUser, type TestContext } from "../../testing/harness";

let ctx: TestContext;
let clinician: SeededUser;
let mine: SeededUser;
let other: SeededUser;
beforeAll(async () => {
  ctx = await createTestContext();
  clinician = await ctx.seedUser({ role: "clinician" });
  mine = await ctx.seedUser({ role: "patient", caseloadOf: [clinician.id] });
  other = await ctx.seedUser({ role: "patient" });
});
afterAll(() => ctx?.close());

const auth = (u: SeededUser) => ({ userId: u.id, role: u.role as Role, scopes: scopesFor(u.role), patientId: u.patientId, tokenId: "t" });
const status = (p: Promise<void>) => p.then(() => 200, (e: { status?: number }) => e.status ?? 500);

describe("assertPatientAccess", () => {
  it("lets a patient reach only their own record", async () => {
    expect(await status(assertPatientAccess(ctx.db, auth(mine), mine.patientId!, "clinical"))).toBe(200);
    expect(await status(assertPatientAccess(ctx.db, auth(mine), other.patientId!, "clinical"))).toBe(404);
  });

  it("lets a clinician reach their caseload only", async () => {
    expect(await status(assertPatientAccess(ctx.db, auth(clinician), mine.patientId!, "clinical"))).toBe(200);
    expect(await status(assertPatientAccess(ctx.db, auth(clinician), other.patientId!, "clinical"))).toBe(404);
  });

  it("gives admins identity views but no clinical data, and researchers nothing", async () => {
    const admin = await ctx.seedUser({ role: "admin" });
    const researcher = await ctx.seedUser({ role: "researcher" });
    expect(await status(assertPatientAccess(ctx.db, auth(admin), other.patientId!, "identity"))).toBe(200);
    expect(await status(assertPatientAccess(ctx.db, auth(admin), other.patientId!, "clinical"))).toBe(404);
    expect(await status(assertPatientAccess(ctx.db, auth(admin), "00000000-0000-4000-8000-000000000000", "identity"))).toBe(404);
    expect(await status(assertPatientAccess(ctx.db, auth(researcher), mine.patientId!, "identity"))).toBe(404);
  });

  it("answers a malformed id like a missing one", async () => {
    expect(await status(assertPatientAccess(ctx.db, auth(clinician), "1 OR 1=1", "clinical"))).toBe(404);
  });
});
