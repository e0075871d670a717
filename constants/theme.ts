import { colors } from './colors';
import { fonts } from './fonts';

export { colors, fonts };

export const space = { xs: 4, sm: 8, md: 12, lg: 16, xl: 24, xxl: 36 } as const;

export const radius = { sm: 6, md: 10, lg: 16 } as const;

/** The font files for expo-font on native (hooks/use-app-fonts.ts); the web build declares them in index.html. */
export const fontFiles = {
  [fonts.body]: require('../fonts/AtkinsonHyperlegible_400Regular.ttf'),
  [fonts.bodyBold]: require('../fonts/AtkinsonHyperlegible_700Bold.ttf'),
  [fonts.heading]: require('../fonts/Fraunces_600SemiBold.ttf'),
};

/** At this width and above the navigation moves to the side (DESIGN.md, Client). */
export const WIDE_BREAKPOINT = 1024;

/** react-native-calendars theme, shared by every month view so they read alike. */
export const calendarTheme = {
  calendarBackground: colors.card,
  todayTextColor: colors.thread,
  dayTextColor: colors.ink,
  textDisabledColor: colors.line,
  monthTextColor: colors.ink,
  arrowColor: colors.loom,
  selectedDayBackgroundColor: colors.loom,
  textDayFontFamily: fonts.body,
  textMonthFontFamily: fonts.heading,
  textDayHeaderFontFamily: fonts.bodyBold,
};

/**
 * Marks for a wish in the coordinators' wishes grid: a glyph (so the stance reads without colour)
 * on a tint of the same family the staff wish chips use. Our own: a plus for "prefer", a dash for
 * "avoid", a cross on a bordered cell for "cannot".
 */
export const wishMarks = {
  prefer: { glyph: '+', ink: colors.ok, fill: '#DCEBDD', border: '#B7D3BA', word: 'Prefer' },
  avoid: { glyph: '–', ink: '#8A4714', fill: colors.threadSoft, border: '#E3C2A2', word: 'Avoid' },
  cannot: { glyph: '×', ink: colors.danger, fill: colors.dangerSoft, border: colors.danger, word: 'Cannot' },
} as const;

/** Status colours for absences: a request waits (ochre), approved is settled (green), declined is struck (grey). */
export const absenceTones = { requested: 'warn', approved: 'good', declined: 'plain' } as const;


/** The roster grid's marks; in a file of their own so the server's PDF can read them without the font files. */
export { gridColors } from './grid-colors';
