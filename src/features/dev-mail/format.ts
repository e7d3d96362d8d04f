export function formatReceivedAt(iso: string): string {
  const date = new Date(iso);
  if (Number.isNaN(date.getTime())) return iso;
  return new Intl.DateTimeFormat(undefined, { dateStyle: 'medium', timeStyle: 'short' }).format(date);
}

export type TextPart = { kind: 'text'; value: string } | { kind: 'link'; value: string };

/** Splits plain text so that http(s) addresses (invitation links, status links) can be clicked. */
export function splitLinks(text: string): TextPart[] {
  const parts: TextPart[] = [];
  const pattern = /https?:\/\/[^\s<>"')\]]+/g;
  let last = 0;
  for (const match of text.matchAll(pattern)) {
    const start = match.index ?? 0;
    if (start > last) parts.push({ kind: 'text', value: text.slice(last, start) });
    parts.push({ kind: 'link', value: match[0] });
    last = start + match[0].length;
  }
  if (last < text.length) parts.push({ kind: 'text', value: text.slice(last) });
  return parts;
}

/**
 * The message's HTML for a sandboxed frame, with every link opening in a new tab: a link followed
 * inside the frame would load the app (or anything else) in the frame itself.
 */
export function framedMailDocument(html: string): string {
  const base = '<base target="_blank">';
  // drop any base the message brings, so its links cannot be pointed back into the frame
  const cleaned = html.replace(/<base\b[^>]*>/gi, '');
  if (/<head\b[^>]*>/i.test(cleaned)) return cleaned.replace(/<head\b[^>]*>/i, (head) => `${head}${base}`);
  return `<!doctype html><html><head>${base}</head><body>${cleaned}</body></html>`;
}
