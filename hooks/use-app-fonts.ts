import { useFonts } from 'expo-font';
import { fontFiles } from '@/constants/theme';

/** True once the app's fonts can be drawn (or failed to load, when the system font stands in). */
export function useAppFonts(): boolean {
  const [loaded, error] = useFonts(fontFiles);
  return loaded || error !== null;
}
