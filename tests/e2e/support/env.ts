import { fileURLToPath } from "node:url";

/** The running product under test; scripts/test.sh starts it against a throwaway, seeded database. */
export function baseUrl(): string {
  const url = process.env.PENDULA_E2E_URL;
  if (!url) {
    throw new Error(
      "PENDULA_E2E_URL is not set: start the product (npm start prints http://127.0.0.1:PORT) and export it, or run scripts/test.sh",
    );
  }
  return url.replace(/\/+$/, "");
}

/** Git-ignored folder at the repository root where every main screen is saved for a human to look at. */
export const SCREENSHOT_DIR = fileURLToPath(new URL("../../../.screenshots/", import.meta.url));

export const CHROMIUM_PATH = process.env.PENDULA_CHROMIUM ?? "/usr/bin/chromium";

/** The demo seed's password for every demo account (db/seeds). */
export const DEMO_PASSWORD = "demo-walk-2026";

export const DEMO_USERS = {
  admin: "admin@demo.pendula.test",
  researcher: "researcher@demo.pendula.test",
  clinician: "clinician@demo.pendula.test",
  clinician2: "clinician2@demo.pendula.test",
  patient: "patient@demo.pendula.test",
  patient2: "patient2@demo.pendula.test",
} as const;

export type DemoUser = keyof typeof DEMO_USERS;
