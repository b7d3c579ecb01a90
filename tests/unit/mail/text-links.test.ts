import { describe, test, expect } from 'vitest';
import fc from 'fast-check';
import { splitLinks, escapeHtml, textToHtml } from '@/lib/mail/text-links';

describe('splitting links out of plain text', () => {
  test('a link on its own line', () => {
    expect(splitLinks('Use this:\nhttp://localhost:4321/account/invite?token=a-b_c\nThanks')).toEqual([
      { kind: 'text', text: 'Use this:\n' },
      { kind: 'link', href: 'http://localhost:4321/account/invite?token=a-b_c' },
      { kind: 'text', text: '\nThanks' },
    ]);
  });
  test('sentence punctuation after a link stays text', () => {
    expect(splitLinks('See https://pool.example/x.')).toEqual([
      { kind: 'text', text: 'See ' },
      { kind: 'link', href: 'https://pool.example/x' },
      { kind: 'text', text: '.' },
    ]);
  });
  test('no links, only text; other schemes are not links', () => {
    expect(splitLinks('ftp://x.example and javascript:alert(1)')).toEqual([{ kind: 'text', text: 'ftp://x.example and javascript:alert(1)' }]);
    expect(splitLinks('')).toEqual([]);
  });
  test('joining the segments gives the text back (property)', () => {
    fc.assert(
      fc.property(fc.array(fc.oneof(fc.string(), fc.constantFrom('https://a.example/p?q=1', 'http://b.example', ' ', '\n', '.'))), (parts) => {
        const text = parts.join('');
        const joined = splitLinks(text)
          .map((s) => (s.kind === 'link' ? s.href : s.text))
          .join('');
        expect(joined).toBe(text);
      }),
    );
  });
});

describe('HTML from text', () => {
  test('escapes the five HTML-special characters (OWASP XSS prevention, rule #1)', () => {
    expect(escapeHtml(`<a href="x">'&'</a>`)).toBe('&lt;a href=&quot;x&quot;&gt;&#39;&amp;&#39;&lt;/a&gt;');
  });
  test('paragraphs and line breaks', () => {
    const html = textToHtml('One\ntwo\n\nThree');
    expect(html).toContain('<p>One<br>\ntwo</p>\n<p>Three</p>');
  });
});
