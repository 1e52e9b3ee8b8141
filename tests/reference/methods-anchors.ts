/**
 * Heading anchors as GitHub renders them, so a comment's `docs/methods.md#anchor` works as a link
 * on the hosting site and can be checked here.
 */

/** Inline Markdown reduced to its visible text: code spans, links, emphasis. */
function visibleText(heading: string): string {
  return heading
    .replace(/`([^`]*)`/g, "$1")
    .replace(/!?\[([^\]]*)\]\([^)]*\)/g, "$1")
    .replace(/[*_~]{1,3}([^*_~]+)[*_~]{1,3}/g, "$1");
}

/** GitHub's anchor: lower case, punctuation and symbols dropped, each space a hyphen. */
export function slugifyHeading(heading: string): string {
  return visibleText(heading)
    .trim()
    .toLowerCase()
    .replace(/[^\p{L}\p{M}\p{N}\p{Pc}\- ]/gu, "")
    .replace(/ /g, "-");
}

/** Every heading anchor of a Markdown text, repeated headings numbered -1, -2 as GitHub does. */
export function headingAnchors(markdown: string): Set<string> {
  const anchors = new Set<string>();
  const seen = new Map<string, number>();
  let fenced = false;
  for (const line of markdown.split("\n")) {
    if (/^\s*(```|~~~)/.test(line)) fenced = !fenced;
    if (fenced) continue;
    const heading = /^#{1,6}\s+(.*?)\s*#*\s*$/.exec(line)?.[1];
    if (heading === undefined) continue;
    const explicit = /\{#([\w-]+)\}\s*$/.exec(heading)?.[1];
    if (explicit !== undefined) {
      anchors.add(explicit);
      continue;
    }
    const base = slugifyHeading(heading);
    const count = seen.get(base) ?? 0;
    seen.set(base, count + 1);
    anchors.add(count === 0 ? base : `${base}-${count}`);
  }
  return anchors;
}

/** Anchors cited as `docs/methods.md#…` (any relative prefix); with `local`, also `](#…)` links. */
export function citedAnchors(text: string, local: boolean): string[] {
  const found = [...text.matchAll(/docs\/methods\.md#([\p{L}\p{N}_-]+)/gu)].map((m) => m[1] ?? "");
  if (local) found.push(...[...text.matchAll(/\]\(#([\p{L}\p{N}_-]+)\)/gu)].map((m) => m[1] ?? ""));
  return found;
}

/** True when a line points at the methods notes kept outside the repository. */
export function mentionsOutsideNotes(line: string): boolean {
  return /\bDOMAIN(\.md\b|\s*§|\s+(worked|check|Monte|re-checked)\b|,\s*shank)/.test(line);
}
