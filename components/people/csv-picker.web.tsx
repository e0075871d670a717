import { useRef, type ChangeEvent } from 'react';
import { StyleSheet } from 'react-native';
import { colors, fonts, radius, space } from '@/constants/theme';

/**
 * The browser's own file chooser behind a real button: screen readers meet one control, named
 * and with the button role, and pressing it opens the chooser. The file input itself stays out of
 * the way (display: none, out of the tab order). It is cleared after each pick, so choosing the
 * same (corrected) file again still counts as a new pick.
 */
export function CsvPicker({ onPick, disabled, label = 'Choose a CSV file' }: { onPick: (file: File) => void; disabled?: boolean; label?: string }) {
  const input = useRef<HTMLInputElement>(null);
  const changed = (e: ChangeEvent<HTMLInputElement>) => {
    const file = e.target.files?.[0];
    if (file) onPick(file);
    e.target.value = '';
  };
  return (
    <>
      <button type="button" onClick={() => input.current?.click()} disabled={disabled} style={{ ...buttonStyle, opacity: disabled ? 0.6 : 1, cursor: disabled ? 'default' : 'pointer' }} data-testid="csv-picker">
        {label}
      </button>
      <input ref={input} type="file" accept=".csv,text/csv,text/plain" onChange={changed} disabled={disabled} tabIndex={-1} aria-hidden="true" data-testid="csv-file-input" style={{ display: 'none' }} />
    </>
  );
}

// CSS has no paddingHorizontal: these are DOM elements, not React Native views.
const base = StyleSheet.flatten({ minHeight: 48, borderRadius: radius.md, paddingLeft: space.xl, paddingRight: space.xl, backgroundColor: colors.thread, color: colors.white, fontFamily: fonts.bodyBold, fontSize: 16 });
const buttonStyle = { ...base, display: 'inline-flex', alignItems: 'center', justifyContent: 'center', alignSelf: 'flex-start', boxSizing: 'border-box', border: 'none' } as const;
