// Where a visitor may be sent after signing in: only a path on this site.
//
// Why each refusal (WHATWG URL Standard, "URL parsing"): the parser deletes
// every ASCII tab and newline before it starts, so `/\t/evil.example` becomes
// `//evil.example`, a scheme-relative URL on another host; for http(s) it reads
// `\` as `/`, so `/\evil.example` is `//evil.example` too; `//host` is
// scheme-relative on its own. Percent-encoded forms of the same characters are
// refused as well, so a value decoded once more by some later step (a proxy, the
// page's script, a second redirect) cannot turn into one of them.

const MAX_LENGTH = 2048;
/** C0 controls, DEL, C1 controls, and the Unicode line/paragraph separators. */
const CONTROL = /[\u0000-\u001f\u007f-\u009f\u2028\u2029]/;
const BASE = 'http://next-path.invalid';

function acceptableForm(text: string): boolean {
  return text.startsWith('/') && !text.includes('//') && !text.includes('\\') && !CONTROL.test(text);
}

/**
 * The same-origin path `value` names, normalised (`/a/../b` → `/b`), or
 * `fallback` when it names anything else or is malformed. Used for both the
 * signed-in 303 and the signed-out page's `next` value (src/pages/login.astro).
 */
export function safeNextPath(value: string | null | undefined, fallback = '/'): string {
  if (typeof value !== 'string' || value.length === 0 || value.length > MAX_LENGTH) return fallback;
  // The value and every further percent-decoding of it must pass.
  let form = value;
  for (let round = 0; round < 4; round += 1) {
    if (!acceptableForm(form)) return fallback;
    let decoded: string;
    try {
      decoded = decodeURIComponent(form);
    } catch {
      return fallback; // a lone or malformed `%`
    }
    if (decoded === form) break;
    if (round === 3) return fallback; // still decoding after four rounds: nobody writes that by hand
    form = decoded;
  }
  let url: URL;
  try {
    url = new URL(value, BASE);
  } catch {
    return fallback;
  }
  if (url.origin !== BASE) return fallback;
  const path = url.pathname + url.search + url.hash;
  return acceptableForm(path) ? path : fallback;
}
