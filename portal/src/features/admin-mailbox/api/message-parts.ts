export type MessagePart = { kind: "text"; text: string } | { kind: "link"; href: string; sameOrigin: boolean };

// http(s) URLs up to whitespace or a closing bracket/quote; trailing sentence punctuation is not part of a link.
const URL_PATTERN = /https?:\/\/[^\s<>"')\]]+/g;

/**
 * Splits a plain-text e-mail into text and links, so the mailbox can render links as real anchors
 * without ever inserting the message's HTML into the page (captured mail is untrusted input).
 */
export function splitLinks(text: string, origin: string): MessagePart[] {
  const parts: MessagePart[] = [];
  let last = 0;
  for (const match of text.matchAll(URL_PATTERN)) {
    let href = match[0];
    const trailing = /[.,;:!?]+$/.exec(href)?.[0] ?? "";
    href = href.slice(0, href.length - trailing.length);
    const start = match.index;
    if (start > last) parts.push({ kind: "text", text: text.slice(last, start) });
    let sameOrigin = false;
    try {
      sameOrigin = new URL(href).origin === origin;
    } catch {
      /* not a URL after all: keep as a link but treat as foreign */
    }
    parts.push({ kind: "link", href, sameOrigin });
    last = start + href.length;
  }
  if (last < text.length) parts.push({ kind: "text", text: text.slice(last) });
  return parts;
}

/** The in-app path of a same-origin link, so following it stays inside the single-page app. */
export function inAppPath(href: string): string {
  const url = new URL(href);
  return `${url.pathname}${url.search}${url.hash}`;
}
