// The "Knex only in repositories" rule of eslint.config.js, exercised on small snippets at virtual
// paths, so a typo in a selector or a moved config block cannot silently switch it off. Source of
// the rule: DEVELOPERS.md "Conventions" (common practice for a layered service: queries live in
// one layer).
import { fileURLToPath } from "node:url";
import { ESLint } from "eslint";
import { beforeAll, describe, expect, it } from "vitest";

const ROOT = fileURLToPath(new URL("../..", import.meta.url));
let eslint: ESLint;

beforeAll(() => {
  eslint = new ESLint({ cwd: ROOT });
});

async function queryErrors(code: string, path: string): Promise<string[]> {
  const [result] = await eslint.lintText(`${code}\n`, { filePath: `${ROOT}/${path}` });
  if (!result) throw new Error("ESLint returned no result");
  const fatal = result.messages.filter((m) => m.fatal);
  if (fatal.length > 0) throw new Error(`snippet did not parse: ${fatal.map((m) => m.message).join("; ")}`);
  return result.messages.filter((m) => m.ruleId === "no-restricted-syntax").map((m) => m.message);
}

const QUERIES = [
  'export const f = (deps: { db: (t: string) => unknown }) => deps.db("patients");',
  'export const f = (db: (t: string) => unknown) => db("patients");',
  'export const f = (trx: (t: string) => unknown) => trx("patients");',
  'export const f = (db: { raw: (q: string) => unknown }) => db.raw("SELECT 1");',
];
const ALLOWED = [
  'export const f = (deps: { db: { transaction: (w: () => unknown) => unknown } }) => deps.db.transaction(() => 1);',
  'export const f = (repo: { list: (db: unknown) => unknown }, db: unknown) => repo.list(db);',
];

describe("Knex only in repositories", () => {
  for (const path of ["ingest-server/src/routes/things/things.service.ts", "ingest-server/src/routes/things/things.router.ts"]) {
    it(`refuses a query built in ${path.split("/").pop()}`, async () => {
      for (const code of QUERIES) expect(await queryErrors(code, path), code).toEqual([expect.stringContaining("repository")]);
    });
    it(`allows transactions and repository calls in ${path.split("/").pop()}`, async () => {
      for (const code of ALLOWED) expect(await queryErrors(code, path), code).toEqual([]);
    });
  }

  it("allows queries in a repository", async () => {
    for (const code of QUERIES) expect(await queryErrors(code, "ingest-server/src/routes/things/things.repository.ts"), code).toEqual([]);
  });
});
