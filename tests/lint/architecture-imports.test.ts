// The package arrows in eslint.config.js, exercised on small snippets at virtual paths so a typo in
// a pattern or a reordered config block cannot silently switch a rule off. Source of the rules:
// DEVELOPERS.md "Layout" (common practice for layered packages: inner layers never import outer ones).
import { fileURLToPath } from "node:url";
import { ESLint } from "eslint";
import { beforeAll, describe, expect, it } from "vitest";

const ROOT = fileURLToPath(new URL("../..", import.meta.url));
let eslint: ESLint;

beforeAll(() => {
  eslint = new ESLint({ cwd: ROOT });
});

/** Messages of the import rule for one line of code placed at `path` (relative to the repository). */
async function importErrors(code: string, path: string): Promise<string[]> {
  const [result] = await eslint.lintText(`${code}\nexport const used = x;\n`, { filePath: `${ROOT}/${path}` });
  if (!result) throw new Error("ESLint returned no result");
  const fatal = result.messages.filter((m) => m.fatal);
  if (fatal.length > 0) throw new Error(`snippet did not parse: ${fatal.map((m) => m.message).join("; ")}`);
  return result.messages.filter((m) => m.ruleId === "no-restricted-imports").map((m) => m.message);
}

interface Case {
  path: string;
  code: string;
  /** A word the rule's message must contain, or null when the import is allowed. */
  expect: string | null;
}

const cases: Record<string, Case[]> = {
  "signal imports no outer package": [
    { path: "signal/src/gait/x.ts", code: 'import { x } from "@pendula/ingest-server";', expect: "innermost" },
    { path: "signal/src/gait/x.ts", code: 'import { x } from "@pendula/db";', expect: "innermost" },
    { path: "signal/src/gait/x.ts", code: 'import { x } from "@pendula/portal/src/lib/x";', expect: "innermost" },
    { path: "signal/src/io/__tests__/x.test.ts", code: 'import { x } from "../../../../tests/fuzz/support/x";', expect: "innermost" },
    { path: "signal/bench/x.ts", code: 'import { x } from "../../ingest-server/src/x";', expect: "innermost" },
    { path: "signal/src/gait/x.ts", code: 'import { x } from "../filter";', expect: null },
    { path: "signal/src/gait/x.ts", code: 'import { x } from "ml-matrix";', expect: null },
  ],
  "signal/src does no I/O outside the CLI and tests": [
    { path: "signal/src/gait/x.ts", code: 'import { x } from "node:fs";', expect: "pure analysis" },
    { path: "signal/src/io/x.ts", code: 'import { x } from "fs/promises";', expect: "pure analysis" },
    { path: "signal/src/io/x.ts", code: 'import { x } from "node:child_process";', expect: "pure analysis" },
    { path: "signal/src/cli.ts", code: 'import { x } from "node:fs";', expect: null },
    { path: "signal/src/io/__tests__/x.test.ts", code: 'import { x } from "node:fs";', expect: null },
    { path: "signal/bench/x.ts", code: 'import { x } from "node:fs";', expect: null },
  ],
  "db imports neither the server nor the portal": [
    { path: "db/src/x.ts", code: 'import { x } from "@pendula/ingest-server";', expect: "below the server" },
    { path: "db/src/x.ts", code: 'import { x } from "../../portal/src/x";', expect: "below the server" },
    { path: "db/src/x.ts", code: 'import { x } from "knex";', expect: null },
  ],
  "processing, upload parsing and the worker do not import routes": [
    { path: "ingest-server/src/processing/x.ts", code: 'import { x } from "../routes/sessions/x";', expect: "neutral module" },
    { path: "ingest-server/src/processing/__tests__/x.test.ts", code: 'import { x } from "../../routes/x";', expect: "neutral module" },
    { path: "ingest-server/src/uploads/x.ts", code: 'import { x } from "../routes/sessions/x";', expect: "neutral module" },
    { path: "ingest-server/src/worker.ts", code: 'import { x } from "./routes/patients/x";', expect: "neutral module" },
    { path: "ingest-server/src/processing/x.ts", code: 'import { x } from "../sessions/x";', expect: null },
    { path: "ingest-server/src/routes/sessions/x.ts", code: 'import { x } from "../../uploads/x";', expect: null },
    { path: "ingest-server/src/routes/sessions/x.ts", code: 'import { x } from "../../processing/x";', expect: null },
  ],
  "the server does not import the portal or the tests": [
    { path: "ingest-server/src/x.ts", code: 'import { x } from "@pendula/portal";', expect: "does not import" },
    { path: "ingest-server/src/x.ts", code: 'import { x } from "@pendula/signal";', expect: null },
    { path: "ingest-server/src/x.ts", code: 'import { x } from "@pendula/db";', expect: null },
  ],
  "the portal imports only the server's contracts and signal": [
    { path: "portal/src/lib/x.ts", code: 'import { x } from "@pendula/ingest-server";', expect: "contracts" },
    { path: "portal/src/lib/x.ts", code: 'import { x } from "@pendula/ingest-server/src/metrics/x";', expect: "contracts" },
    { path: "portal/src/lib/x.ts", code: 'import { x } from "@pendula/db";', expect: "only @pendula/signal" },
    { path: "portal/src/features/research/x.ts", code: 'import { x } from "../../../../ingest-server/src/x";', expect: "package name" },
    { path: "portal/src/features/research/x.ts", code: 'import { x } from "@pendula/ingest-server";', expect: "contracts" },
    { path: "portal/src/lib/x.ts", code: 'import { x } from "@pendula/ingest-server/contracts";', expect: null },
    { path: "portal/src/features/research/x.ts", code: 'import { x } from "@pendula/ingest-server/contracts";', expect: null },
    { path: "portal/src/lib/x.ts", code: 'import { x } from "@pendula/signal";', expect: null },
  ],
  "portal features do not import each other": [
    { path: "portal/src/features/caseload/components/x.tsx", code: 'import { x } from "@/features/notes";', expect: "do not import each other" },
    { path: "portal/src/features/caseload/components/x.tsx", code: 'import { x } from "@/features/notes/api/x";', expect: "do not import each other" },
    { path: "portal/src/features/caseload/components/x.tsx", code: 'import { x } from "../../notes/api/x";', expect: "do not import each other" },
    { path: "portal/src/features/caseload/x.ts", code: 'import { x } from "../notes";', expect: "do not import each other" },
    { path: "portal/src/features/caseload/components/x.tsx", code: 'import { x } from "../api/x";', expect: null },
    { path: "portal/src/features/caseload/components/x.tsx", code: 'import { x } from "@/features/caseload/api/x";', expect: null },
    { path: "portal/src/features/caseload/components/x.tsx", code: 'import { x } from "@/lib/api-client";', expect: null },
    { path: "portal/src/features/caseload/components/x.tsx", code: 'import { x } from "@/components/ui";', expect: null },
    { path: "portal/src/app/routes/x.ts", code: 'import { x } from "@/features/notes";', expect: null },
  ],
};

describe.each(Object.entries(cases))("%s", (_name, list) => {
  it.each(list)("$path: $code", async ({ path, code, expect: word }) => {
    const errors = await importErrors(code, path);
    if (word === null) {
      expect(errors).toEqual([]);
    } else {
      expect(errors).toHaveLength(1);
      expect(errors[0]).toContain(word);
    }
  });
});

