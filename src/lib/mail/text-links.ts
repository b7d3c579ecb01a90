// Plain-text mail bodies carry their links as bare URLs. To show such a body
// on a page (or in the HTML alternative of a message) the URLs become links
// and everything else stays text, escaped by whoever renders it.

export type TextSegment = { kind: 'text'; text: string } | { kind: 'link'; href: string };

// http(s) URLs up to the first whitespace or angle bracket; trailing sentence
// punctuation is not part of the URL ("…here: https://x/y." → "https://x/y").
const URL_PATTERN = /https?:\/\/[^\s<>"]+/g;
const TRAILING_PUNCTUATION = /[.,;:!?)\]'"]+$/;

/** Splits text into plain runs and http(s) links, in order; joining them gives the text back. */
export function splitLinks(text: string): TextSegment[] {
  const out: TextSegment[] = [];
  let last = 0;
  for (const match of text.matchAll(URL_PATTERN)) {
    const start = match.index ?? 0;
    const href = match[0].replace(TRAILING_PUNCTUATION, '');
    if (href.length <= 'https://'.length) continue;
    if (start > last) out.push({ kind: 'text', text: text.slice(last, start) });
    out.push({ kind: 'link', href });
    last = start + href.length;
  }
  if (last < text.length) out.push({ kind: 'text', text: text.slice(last) });
  return out;
}

export function escapeHtml(text: string): string {
  return text.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;').replace(/'/g, '&#39;');
}

/** A minimal HTML rendering of a plain-text message: paragraphs, line breaks, clickable links. */
export function textToHtml(text: string): string {
  const paragraphs = text.trim().split(/\n{2,}/);
  const body = paragraphs
    .map((p) => {
      const inner = splitLinks(p)
        .map((s) => (s.kind === 'link' ? `<a href="${escapeHtml(s.href)}">${escapeHtml(s.href)}</a>` : escapeHtml(s.text)))
        .join('')
        .replace(/\n/g, '<br>\n');
      return `<p>${inner}</p>`;
    })
    .join('\n');
  return `<!doctype html>\n<html><body style="font-family: sans-serif; line-height: 1.5; color: #17212b;">\n${body}\n</body></html>`;
}
