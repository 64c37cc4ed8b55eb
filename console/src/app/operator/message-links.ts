/** A piece of a plain-text message: text as it is, or a link to open. */
export type MessagePart = { text: string } | { text: string; href: string };

const URL_PATTERN = /https?:\/\/[^\s<>"']+/g;

/**
 * Splits a plain-text e-mail into text and http(s) links, so the links can be clicked. Nothing of the
 * message is ever rendered as HTML; a trailing full stop or bracket stays text, as a reader means it.
 */
export function messageParts(text: string): MessagePart[] {
  const parts: MessagePart[] = [];
  let last = 0;
  for (const match of text.matchAll(URL_PATTERN)) {
    let url = match[0];
    const trailing = /[.,;:!?)\]]+$/.exec(url)?.[0] ?? '';
    url = url.slice(0, url.length - trailing.length);
    const start = match.index;
    if (start > last) parts.push({ text: text.slice(last, start) });
    parts.push({ text: url, href: url });
    last = start + url.length;
  }
  if (last < text.length) parts.push({ text: text.slice(last) });
  return parts;
}

/** Where a link of this server's own console should go inside the app; null for any other address. */
export function consolePath(href: string, origin: string): string | null {
  const url = new URL(href);
  return url.origin === origin ? url.pathname + url.search + url.hash : null;
}
