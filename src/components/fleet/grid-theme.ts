// AG Grid's Theming API set to Loopfold's look: IBM Plex, the palette tokens read
// from tailwind.config.mjs (one source of truth, no hex codes here), tabular figures.
import { themeQuartz } from 'ag-grid-community';
import tailwindConfig from '../../../tailwind.config.mjs';

interface Palette {
  ink: { DEFAULT: string; soft: string; faint: string };
  paper: { DEFAULT: string; deep: string; line: string };
  card: string;
  kelp: { DEFAULT: string; hover: string; tint: string };
  harbour: { DEFAULT: string; tint: string };
}
const colors = (tailwindConfig as unknown as { theme: { extend: { colors: Palette } } }).theme.extend.colors;
const fonts = (tailwindConfig as unknown as { theme: { extend: { fontFamily: { sans: string[]; mono: string[] } } } }).theme.extend.fontFamily;

export const loopfoldGridTheme = themeQuartz.withParams({
  fontFamily: fonts.sans.join(', '),
  headerFontFamily: fonts.sans.join(', '),
  fontSize: 14,
  headerFontSize: 13,
  headerFontWeight: 600,
  foregroundColor: colors.ink.DEFAULT,
  textColor: colors.ink.DEFAULT,
  subtleTextColor: colors.ink.faint,
  backgroundColor: colors.card,
  chromeBackgroundColor: colors.paper.DEFAULT,
  headerBackgroundColor: colors.paper.deep,
  headerTextColor: colors.ink.DEFAULT,
  borderColor: colors.paper.line,
  accentColor: colors.kelp.DEFAULT,
  rowHoverColor: colors.kelp.tint,
  selectedRowBackgroundColor: colors.harbour.tint,
  oddRowBackgroundColor: colors.card,
  wrapperBorderRadius: 8,
  rowHeight: 36, // a desktop grid (mouse): compact rows show more bins; the phone pages keep 44 px targets
  headerHeight: 44,
  spacing: 6,
  browserColorScheme: 'light',
});
