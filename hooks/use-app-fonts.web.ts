/**
 * On the web the fonts are declared in index.html by the build (preloaded, font-display: swap), so
 * text is drawn at once in the system font and switches when each file arrives; nothing to wait for.
 */
export function useAppFonts(): boolean {
  return true;
}
