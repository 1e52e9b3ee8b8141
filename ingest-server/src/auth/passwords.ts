import bcrypt from "bcryptjs";

/** bcrypt (adaptive; cost from BCRYPT_COST, 12 in production, 4 in tests). */
export function hashPassword(password: string, cost: number): Promise<string> {
  return bcrypt.hash(password, cost);
}

export function verifyPassword(password: string, hash: string): Promise<boolean> {
  return bcrypt.compare(password, hash);
}

// A fixed hash to compare against when the e-mail is unknown, so response time does not reveal
// whether an account exists.
const decoys = new Map<number, Promise<string>>();
export function decoyHash(cost: number): Promise<string> {
  let h = decoys.get(cost);
  if (!h) {
    h = bcrypt.hash("decoy-password-never-matches", cost);
    decoys.set(cost, h);
  }
  return h;
}
