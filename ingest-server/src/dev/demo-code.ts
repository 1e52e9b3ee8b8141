import path from "node:path";
import { fileURLToPath } from "node:url";
import { DEMO_STAFF, DEMO_TOTP_SECRET } from "../../../db/seeds/demo-scenario";
import { totpCode, TOTP_PERIOD_S } from "../auth/totp";

/**
 * `npm run demo:code -- <demo staff e-mail>`: prints the current sign-in code of a demo staff
 * account (they share the published demo secret), and how long it stays current. Only the demo
 * accounts: a real account's codes come from its owner's app.
 */
export async function demoCodeCommand(args: string[], now: number = Date.now()): Promise<{ code: number; out: string }> {
  const email = (args[0] ?? "").trim().toLowerCase();
  const staff = DEMO_STAFF.find((s) => s.email.toLowerCase() === email);
  if (!staff) {
    return {
      code: 2,
      out: `usage: npm run demo:code -- <e-mail>\nwhere <e-mail> is a demo staff account: ${DEMO_STAFF.map((s) => s.email).join(", ")}\n`,
    };
  }
  const left = TOTP_PERIOD_S - (Math.floor(now / 1000) % TOTP_PERIOD_S);
  return {
    code: 0,
    out: `${await totpCode(DEMO_TOTP_SECRET, now)}\n(${staff.email}; current for ${left} more s. A code works once: if the portal says it was already used, run this again when the next one is due.)\n`,
  };
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const { code, out } = await demoCodeCommand(process.argv.slice(2));
  (code === 0 ? process.stdout : process.stderr).write(out);
  process.exit(code);
}
