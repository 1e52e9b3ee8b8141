import { afterAll, beforeAll } from "vitest";
import { createTestContext, type SeededUser, type TestContext } from "./harness";

export interface UploadingPatient {
  ctx: TestContext;
  patient: SeededUser;
  /** The patient's access token, for uploads as that patient. */
  token: string;
}

/**
 * For a test file whose tests upload as one patient and process what they uploaded: registers the
 * file's beforeAll (a server context taking files up to 8 MiB, room for a few minutes of synthetic
 * four-sensor walking at about 0.4 MiB per file per minute, and the patient) and afterAll (close).
 * The fields are filled once beforeAll has run: read them inside tests, not at import.
 */
export function uploadingPatientSuite(): UploadingPatient {
  const suite = {} as UploadingPatient;
  beforeAll(async () => {
    suite.ctx = await createTestContext({ env: { UPLOAD_MAX_FILE_BYTES: String(8 * 1024 * 1024) } });
    suite.patient = await suite.ctx.seedUser({ role: "patient" });
    suite.token = await suite.ctx.tokenFor(suite.patient);
  });
  afterAll(async () => {
    await suite.ctx?.close();
  });
  return suite;
}
