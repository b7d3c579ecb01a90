// The public bin page's languages: every language has every text, counted texts have the plural forms the
// language needs, placeholders match English, the visitor's language is picked from Accept-Language with English
// as the fallback, and the form checks speak the sender's language.
import { describe, expect, test } from 'vitest';
import { PUBLIC_LANGUAGES, PUBLIC_WORDS, pickPublicLanguage, publicWords, returnInstructionsFor, type PublicLanguage } from '@/lib/requests/public-words';
import { collectionRequestFieldsIn, damageReportFieldsIn, fieldProblems } from '@/lib/requests/report-forms';

const PLURAL = /_(zero|one|two|few|many|other)$/;
const placeholders = (text: string) => [...text.matchAll(/\{\{(\w+)\}\}/g)].map((m) => m[1]).sort();
const english = PUBLIC_WORDS.en;
const singularKeys = Object.keys(english).filter((k) => !PLURAL.test(k));
const pluralBases = [
  ...new Set(
    Object.keys(english)
      .filter((k) => PLURAL.test(k))
      .map((k) => k.replace(PLURAL, '')),
  ),
];

describe('every language has every text', () => {
  test.each(PUBLIC_LANGUAGES)('%s: the same keys as English, none empty, the same placeholders', (language) => {
    const words = PUBLIC_WORDS[language];
    for (const key of singularKeys) {
      expect(words[key], `${language}.${key}`).toBeTruthy();
      expect(placeholders(words[key]!), `${language}.${key} placeholders`).toEqual(placeholders(english[key]!));
    }
    const unknown = Object.keys(words).filter((k) => !singularKeys.includes(k) && !pluralBases.includes(k.replace(PLURAL, '')));
    expect(unknown, `${language} has keys English does not`).toEqual([]);
  });

  // Outside check: the CLDR plural categories each language needs, as the runtime's Intl.PluralRules reports them
  // (English and Dutch one/other; French one/many/other; Polish one/few/many/other).
  test.each(PUBLIC_LANGUAGES)('%s: a counted text has every plural form the language uses (CLDR, via Intl.PluralRules)', (language) => {
    const categories = new Intl.PluralRules(language).resolvedOptions().pluralCategories;
    for (const base of pluralBases) {
      for (const category of categories) expect(PUBLIC_WORDS[language][`${base}_${category}`], `${language}.${base}_${category}`).toBeTruthy();
    }
  });

  test('Polish counts pick their forms (Polish grammar: 1 minutę, 2–4 and 22–24 minuty, 5–21 and 25 minut)', () => {
    const t = publicWords('pl');
    expect(t('waitMinutes', { count: 1 })).toBe('za około 1 minutę');
    expect(t('waitMinutes', { count: 3 })).toBe('za około 3 minuty');
    expect(t('waitMinutes', { count: 5 })).toBe('za około 5 minut');
    expect(t('waitMinutes', { count: 12 })).toBe('za około 12 minut');
    expect(t('waitMinutes', { count: 22 })).toBe('za około 22 minuty');
    expect(t('waitMinutes', { count: 25 })).toBe('za około 25 minut');
  });

  test('texts are filled in and not escaped twice (the page escapes on output)', () => {
    expect(publicWords('de')('belongsTo', { operator: 'Kade & Co' })).toBe('Dieser Behälter gehört Kade & Co');
    expect(publicWords('en')('quantityMax', { max: 500 })).toBe('At most 500 bins per request; send another for the rest.');
  });
});

describe("the finder's language", () => {
  const cases: Array<[string | null, string | null, PublicLanguage]> = [
    [null, 'nl-BE,nl;q=0.9,en;q=0.8', 'nl'],
    [null, 'de-CH', 'de'],
    [null, 'fr-FR,fr;q=0.9', 'fr'],
    [null, 'pl', 'pl'],
    [null, 'fr;q=0.5, pl;q=0.9', 'pl'], // RFC 9110 §12.4.2: the higher q-value wins
    [null, 'ja,ko;q=0.8', 'en'], // nothing we have: English
    [null, '', 'en'],
    [null, null, 'en'],
    [null, 'en-GB,de;q=0.7', 'en'],
    ['de', 'nl', 'de'], // the switch's choice wins over the browser
    ['xx', 'nl', 'nl'], // an unknown choice is ignored
    ['', 'fr', 'fr'],
  ];
  test.each(cases)('choice %j with Accept-Language %j → %s', (choice, acceptLanguage, expected) => {
    expect(pickPublicLanguage({ choice, acceptLanguage })).toBe(expected);
  });

  test('a language we do not have falls back to English text for text', () => {
    const t = publicWords('ja' as PublicLanguage);
    expect(t('collectTitle')).toBe('Empty and ready for collection');
  });
});

describe('return instructions', () => {
  test("the operator's wording in the visitor's language, else the main wording, else our general sentence", () => {
    expect(returnInstructionsFor('nl', 'Call 0100 before noon.', { nl: 'Bel 0100 voor twaalf uur.' })).toBe('Bel 0100 voor twaalf uur.');
    expect(returnInstructionsFor('de', 'Call 0100 before noon.', { nl: 'Bel 0100 voor twaalf uur.' })).toBe('Call 0100 before noon.');
    expect(returnInstructionsFor('fr', '  ', { fr: '   ' })).toBe(PUBLIC_WORDS.fr.returnDefault);
  });
});

describe('the form checks speak the sender’s language', () => {
  test('a German sender gets German notes; English stays the API default', () => {
    const de = publicWords('de');
    const r = collectionRequestFieldsIn(de).safeParse({ quantity: '0', contactName: 'K', contactPhone: '12' });
    expect(r.success).toBe(false);
    const notes = fieldProblems(r.error!, de);
    expect(notes.quantity).toBe('Mindestens ein Behälter muss warten.');
    expect(notes.contactName).toBe(PUBLIC_WORDS.de.nameMissing);
    expect(notes.contactPhone).toBe('Diese Telefonnummer ist zu kurz.');
    const pl = publicWords('pl');
    const d = damageReportFieldsIn(pl).safeParse({ description: 'Pęknięta\u0007 rama' });
    expect(fieldProblems(d.error!, pl).description).toBe(PUBLIC_WORDS.pl.textControl);
  });
});
