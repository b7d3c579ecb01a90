// The languages the public bin page speaks, each with its own name for the switch (a visitor looks for the name
// they can read). Kept apart from the word tables so forms in the browser can list them without the tables.
export const PUBLIC_LANGUAGES = ['en', 'nl', 'de', 'fr', 'pl'] as const;
export type PublicLanguage = (typeof PUBLIC_LANGUAGES)[number];
export const FALLBACK_LANGUAGE: PublicLanguage = 'en';
export const LANGUAGE_NAMES: Record<PublicLanguage, string> = { en: 'English', nl: 'Nederlands', de: 'Deutsch', fr: 'Français', pl: 'Polski' };
export const isPublicLanguage = (v: unknown): v is PublicLanguage => typeof v === 'string' && (PUBLIC_LANGUAGES as readonly string[]).includes(v);
