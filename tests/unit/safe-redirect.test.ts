import { describe, test, expect } from 'vitest';
import { safeNextPath } from '@/lib/safe-redirect';

// Each refused value is one a browser resolves to another host, or one a further
// percent-decoding would turn into such a value. The host each would reach is
// from the WHATWG URL Standard's parser: tab and newline are deleted before
// parsing; `\` counts as `/` for http(s); `//x` is scheme-relative.
describe('post-sign-in destination: only same-origin paths', () => {
  test.each([
    // kept (normalised by the URL parser)
    ['/fleet', '/fleet'],
    ['/fleet/bins?view=12', '/fleet/bins?view=12'],
    ['/bins/0952123400001600017?tab=log#events', '/bins/0952123400001600017?tab=log#events'],
    ['/trips/../fleet', '/fleet'],
    ['/a%20b', '/a%20b'],
    // another host, plainly
    ['//evil.example/x', '/'],
    ['https://evil.example', '/'],
    ['javascript:alert(1)', '/'],
    ['evil.example', '/'],
    ['', '/'],
    [null, '/'],
    [undefined, '/'],
    // backslashes (WHATWG: `\` is `/` for special schemes)
    ['/\\evil.example', '/'],
    ['\\\\evil.example', '/'],
    // control characters the parser deletes (WHATWG: ASCII tab or newline removed)
    ['/\t/evil.example/phish', '/'],
    ['/\n/evil.example', '/'],
    ['/\r/evil.example', '/'],
    ['/fleet\u0000', '/'],
    ['/fleet\u007f', '/'],
    ['/fleet\u0085', '/'],
    ['/fleet\u2028x', '/'],
    // percent-encoded variants of the same
    ['/%09/evil.example', '/'],
    ['/%0A/evil.example', '/'],
    ['/%2F/evil.example', '/'],
    ['/%2f%2fevil.example', '/'],
    ['/%5Cevil.example', '/'],
    ['/%5cevil.example', '/'],
    ['/%252F%252Fevil.example', '/'],
    ['/%25252F%25252Fevil.example', '/'],
    ['/%2525252F', '/'],
    ['/100%', '/'],
    ['/%E0%A4%A', '/'],
    // `//` later in the value
    ['/fleet//evil.example', '/'],
    ['/login?next=//evil.example', '/'],
  ])('%j → %s', (input, out) => expect(safeNextPath(input)).toBe(out));

  test('the fallback is the caller’s', () => {
    expect(safeNextPath('//evil.example', '/portal')).toBe('/portal');
  });
  test('an overlong value is refused', () => {
    expect(safeNextPath(`/${'a'.repeat(3000)}`)).toBe('/');
  });
  test('every kept value resolves to this origin in the URL parser (outside check: node:url legacy parser agrees)', async () => {
    const { parse } = await import('node:url');
    for (const v of ['/fleet', '/trips/../fleet', '/a%20b', '/fleet/bins?view=12']) {
      const kept = safeNextPath(v);
      expect(new URL(kept, 'https://app.example').host).toBe('app.example');
      expect(parse(kept).host).toBeNull();
    }
  });
});
