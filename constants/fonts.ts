/** Font family names as styles use them; one family per weight in use (regular and bold body, a semibold heading). */
export const fonts = {
  body: 'AtkinsonHyperlegible',
  bodyBold: 'AtkinsonHyperlegible-Bold',
  heading: 'Fraunces-SemiBold',
} as const;

export type FontFamily = (typeof fonts)[keyof typeof fonts];

/**
 * Each family's file in fonts/. Plain data, so the web build (server/bootstrap/web-finish.ts) can
 * declare them in index.html — preloaded, font-display: swap — without loading theme.ts's assets.
 */
export const fontFileNames: Record<FontFamily, string> = {
  [fonts.body]: 'AtkinsonHyperlegible_400Regular.ttf',
  [fonts.bodyBold]: 'AtkinsonHyperlegible_700Bold.ttf',
  [fonts.heading]: 'Fraunces_600SemiBold.ttf',
};
