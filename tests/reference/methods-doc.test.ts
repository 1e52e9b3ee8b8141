import { execFileSync } from "node:child_process";
import { existsSync, readFileSync, readdirSync, statSync } from "node:fs";
import { join, relative } from "node:path";
import { describe, expect, it } from "vitest";
import { citedAnchors, headingAnchors, mentionsOutsideNotes, slugifyHeading } from "./methods-anchors";

/**
 * The methods reference lives in the repository (docs/methods.md) and code cites its sections by
 * anchor. These checks keep it that way: no file may point at a notes file outside the repository,
 * and every `docs/methods.md#anchor` cited anywhere must be a heading anchor of that file.
 */

const ROOT = join(__dirname, "..", "..");
const METHODS = join(ROOT, "docs", "methods.md");
const SCANNED = /\.(ts|tsx|js|mjs|cjs|md|py|sh|json|yml|yaml|html|css|sql|txt)$/;
/** These files spell the patterns they look for. */
const SELF = new Set(["tests/reference/methods-anchors.ts", "tests/reference/methods-doc.test.ts"]);
const SKIP_DIRS = new Set(["node_modules", ".git", "dist", "build", "coverage", ".pendula"]);

/** Tracked files (git), or every file under the root when the tree is not a git checkout. */
function repositoryFiles(): string[] {
  try {
    const out = execFileSync("git", ["ls-files", "-z"], { cwd: ROOT, encoding: "utf8", maxBuffer: 64 * 1024 * 1024 });
    return out.split("\0").filter((f) => f.length > 0);
  } catch {
    const files: string[] = [];
    const walk = (dir: string) => {
      for (const name of readdirSync(dir)) {
        if (SKIP_DIRS.has(name)) continue;
        const full = join(dir, name);
        if (statSync(full).isDirectory()) walk(full);
        else files.push(relative(ROOT, full));
      }
    };
    walk(ROOT);
    return files;
  }
}

function textFiles(): { path: string; text: string }[] {
  return repositoryFiles()
    .filter((f) => SCANNED.test(f) && !f.endsWith("package-lock.json"))
    .filter((f) => existsSync(join(ROOT, f)) && !SELF.has(f))
    .map((f) => ({ path: f, text: readFileSync(join(ROOT, f), "utf8") }));
}

describe("heading anchors (GitHub's rule)", () => {
  // Source: GitHub renders "## Fee Fie Fo Fum" with the anchor #fee-fie-fo-fum — lower case, each
  // space a hyphen, punctuation dropped (public description of GitHub's heading anchors, gist
  // creachadair/e35cefd8e3fbdfe3cce4f6178da1cd70).
  it("lower-cases, turns spaces into hyphens and drops punctuation", () => {
    expect(slugifyHeading("Fee Fie Fo Fum")).toBe("fee-fie-fo-fum");
    expect(slugifyHeading("Stance, swing and double support")).toBe("stance-swing-and-double-support");
    expect(slugifyHeading("FHIR and UCUM")).toBe("fhir-and-ucum");
    expect(slugifyHeading("`hilbert` (SciPy 1.17)")).toBe("hilbert-scipy-117");
    expect(slugifyHeading("semi-AutoBiographical tale/fantasy")).toBe("semi-autobiographical-talefantasy");
  });

  it("numbers a repeated heading -1, -2 and honours an explicit {#id}", () => {
    const md = "# A\n## Notes\n## Notes\n## Notes\n### Shank {#shank-gyro}\n```\n## not a heading\n```\n";
    expect([...headingAnchors(md)]).toEqual(["a", "notes", "notes-1", "notes-2", "shank-gyro"]);
  });

  it("finds citations with and without a relative path, and in-file links", () => {
    const text = "see docs/methods.md#pci and ../../docs/methods.md#cv-1; [x](#local)";
    expect(citedAnchors(text, false)).toEqual(["pci", "cv-1"]);
    expect(citedAnchors(text, true)).toEqual(["pci", "cv-1", "local"]);
  });

  it("recognises every spelling of the outside notes file", () => {
    const name = "DOMAIN";
    expect(mentionsOutsideNotes(`see ${name}.md §3`)).toBe(true);
    expect(mentionsOutsideNotes(`../shared/${name}.md`)).toBe(true);
    expect(mentionsOutsideNotes(`${name} §4`)).toBe(true);
    expect(mentionsOutsideNotes(`${name} worked example`)).toBe(true);
    expect(mentionsOutsideNotes("COOKIE_DOMAIN=example.org")).toBe(false);
  });
});

describe("docs/methods.md", () => {
  const files = textFiles();
  const methods = readFileSync(METHODS, "utf8");
  const anchors = headingAnchors(methods);

  it("is found among the repository's files", () => {
    expect(files.length).toBeGreaterThan(100);
    expect(files.some((f) => f.path === "docs/methods.md")).toBe(true);
    expect(anchors.size).toBeGreaterThan(10);
  });

  it("is the only methods reference: no file points at notes outside the repository", () => {
    const offenders = files.flatMap((f) =>
      f.text
        .split("\n")
        .map((line, i) => ({ line, n: i + 1 }))
        .filter(({ line }) => mentionsOutsideNotes(line))
        .map(({ n, line }) => `${f.path}:${n}: ${line.trim().slice(0, 120)}`),
    );
    expect(offenders).toEqual([]);
  });

  it("has every anchor that the repository cites", () => {
    const missing: string[] = [];
    let cited = 0;
    for (const f of files) {
      for (const anchor of citedAnchors(f.text, f.path === "docs/methods.md")) {
        cited += 1;
        if (!anchors.has(anchor)) missing.push(`${f.path}: #${anchor}`);
      }
    }
    expect(missing).toEqual([]);
    expect(cited).toBeGreaterThan(0);
  });
});
