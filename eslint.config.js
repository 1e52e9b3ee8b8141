// Flat config shared by every workspace; type-aware rules stay off so lint runs in seconds.
import { readdirSync } from "node:fs";
import js from "@eslint/js";
import tseslint from "typescript-eslint";
import globals from "globals";

// Architecture arrows (see DEVELOPERS.md, Layout). Core `no-restricted-imports` with regex
// patterns: no plugin, no resolver. Flat config replaces (does not merge) a rule's options when a
// later block matches the same file, so each block below carries every pattern its files need.
const WORKSPACES = ["signal", "db", "ingest-server", "portal", "tests"];

/** Imports of another workspace, by package name or by a relative path climbing into its folder. */
function workspaceImports(names, message) {
  const alt = names.join("|");
  return [
    { regex: `^@pendula/(${alt})(/|$)`, message },
    { regex: `^(\\.\\./)+(${alt})(/|$)`, message },
  ];
}

const NODE_IO = ["fs", "fs/promises", "path", "child_process", "os", "net", "http", "https", "worker_threads", "readline", "process"];
const nodeIoImports = [
  {
    regex: `^(node:)?(${NODE_IO.join("|")})$`,
    message: "signal/src is pure analysis: file, process and network I/O belong to the CLI, the bench or the callers.",
  },
];

const signalPatterns = workspaceImports(
  WORKSPACES.filter((w) => w !== "signal"),
  "signal/ is the innermost package: it imports nothing from the server, the database, the portal or the tests.",
);
const dbPatterns = workspaceImports(["ingest-server", "portal", "tests"], "db/ sits below the server: it imports nothing from ingest-server, portal or tests.");
const serverPatterns = workspaceImports(["portal", "tests"], "ingest-server/ does not import the portal or the tests.");
const processingPatterns = [
  ...serverPatterns,
  {
    regex: "^(\\.\\.?/)+routes(/|$)",
    message: "Processing and upload parsing run without HTTP: move what they share with a router into a neutral module (e.g. src/sessions/).",
  },
];
const portalPatterns = [
  {
    regex: "^@pendula/ingest-server(?!/contracts(/|$))",
    message: "The portal imports only the server's contracts (@pendula/ingest-server/contracts).",
  },
  ...workspaceImports(["db", "tests", "portal"], "The portal imports only @pendula/signal and the server's contracts."),
  {
    regex: "^(\\.\\./)+(ingest-server|signal)(/|$)",
    message: "Import another workspace by its package name (@pendula/signal, @pendula/ingest-server/contracts), never by a relative path into its sources.",
  },
];

const FEATURES_DIR = new URL("./portal/src/features/", import.meta.url);
const features = readdirSync(FEATURES_DIR, { withFileTypes: true })
  .filter((d) => d.isDirectory())
  .map((d) => d.name)
  .sort();

/** One block per portal feature: it may not reach into a sibling feature. */
function featureBlock(feature) {
  const others = features.filter((f) => f !== feature).map((f) => f.replace(/[.*+?^${}()|[\]\\]/g, "\\$&"));
  const message = `Portal features do not import each other (${feature} → another feature): move the shared code to portal/src/lib or portal/src/components.`;
  const patterns = [...portalPatterns, { regex: `^@/features/(?!${feature}(/|$))`, message }];
  if (others.length > 0) patterns.push({ regex: `^(\\.\\./)+(features/)?(${others.join("|")})(/|$)`, message });
  return { files: [`portal/src/features/${feature}/**/*.{ts,tsx}`], rules: { "no-restricted-imports": ["error", { patterns }] } };
}

const TS = "**/*.{ts,tsx,js,mjs}";

export default tseslint.config(
  { ignores: ["**/node_modules/**", "**/dist/**", ".pendula/**", ".screenshots/**", "**/*.d.ts"] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    languageOptions: { globals: { ...globals.node, ...globals.browser } },
    rules: {
      "@typescript-eslint/no-unused-vars": ["error", { argsIgnorePattern: "^_", varsIgnorePattern: "^_" }],
      "@typescript-eslint/no-explicit-any": "error",
      "no-console": "off",
    },
  },
  { files: [`signal/${TS}`], rules: { "no-restricted-imports": ["error", { patterns: signalPatterns }] } },
  {
    // The CLI, the bench and tests read files; everything else in signal/src gets typed arrays.
    files: [`signal/src/${TS}`],
    ignores: ["signal/src/cli.ts", "signal/src/**/__tests__/**"],
    rules: { "no-restricted-imports": ["error", { patterns: [...signalPatterns, ...nodeIoImports] }] },
  },
  { files: [`db/${TS}`], rules: { "no-restricted-imports": ["error", { patterns: dbPatterns }] } },
  { files: [`ingest-server/${TS}`], rules: { "no-restricted-imports": ["error", { patterns: serverPatterns }] } },
  {
    // The worker, its processing and the upload parse threads run without HTTP.
    files: [`ingest-server/src/processing/${TS}`, `ingest-server/src/uploads/${TS}`, "ingest-server/src/worker.ts"],
    rules: { "no-restricted-imports": ["error", { patterns: processingPatterns }] },
  },
  {
    // Knex only in repositories: a route's service orchestrates (access, rules, transactions, audit)
    // and its router declares endpoints; neither builds a query (DEVELOPERS.md, Conventions).
    files: ["ingest-server/src/routes/**/*.service.ts", "ingest-server/src/routes/**/*.router.ts"],
    rules: {
      "no-restricted-syntax": [
        "error",
        ...[
          "CallExpression[callee.type='Identifier'][callee.name=/^(db|trx|knex)$/]",
          "CallExpression[callee.type='MemberExpression'][callee.property.name='db']",
          "CallExpression[callee.type='MemberExpression'][callee.property.name='raw']",
        ].map((selector) => ({ selector, message: "Knex queries belong in the resource's repository; call a repository function instead." })),
      ],
    },
  },
  { files: [`portal/${TS}`], rules: { "no-restricted-imports": ["error", { patterns: portalPatterns }] } },
  ...features.map(featureBlock),
);
