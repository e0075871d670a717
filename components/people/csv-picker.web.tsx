import { useRef, type ChangeEvent } from 'react';
import { StyleSheet } from 'react-native';
import { colors, fonts, radius, space } from '@/constants/theme';

/**
 * The browser's own file chooser behind a button-like label. The input is cleared after each
 * pick, so choosing the same (corrected) file again still counts as a new pick.
 */
export function CsvPicker({ onPick, disabled, label = 'Choose a CSV file' }: { onPick: (file: File) => void; disabled?: boolean; label?: string }) {
  const input = useRef<HTMLInputElement>(null);
  const changed = (e: ChangeEvent<HTMLInputElement>) => {
    const file = e.target.files?.[0];
    if (file) onPick(file);
    e.target.value = '';
  };
  return (
    <label style={{ ...labelStyle, opacity: disabled ? 0.6 : 1, cursor: disabled ? 'default' : 'pointer' }} data-testid="csv-picker">
      {label}
      <input ref={input} type="file" accept=".csv,text/csv,text/plain" onChange={changed} disabled={disabled} aria-label={label} data-testid="csv-file-input" style={hidden} />
    </label>
  );
}

// CSS has no paddingHorizontal: these are DOM elements, not React Native views.
const base = StyleSheet.flatten({ minHeight: 48, borderRadius: radius.md, paddingLeft: space.xl, paddingRight: space.xl, backgroundColor: colors.thread, color: colors.white, fontFamily: fonts.bodyBold, fontSize: 16 });
const labelStyle = { ...base, display: 'inline-flex', alignItems: 'center', justifyContent: 'center', alignSelf: 'flex-start', boxSizing: 'border-box', position: 'relative' } as const;
// Visually hidden but still focusable and announced (the usual "sr-only" pattern).
const hidden = { position: 'absolute', width: 1, height: 1, padding: 0, margin: -1, overflow: 'hidden', clipPath: 'inset(50%)', whiteSpace: 'nowrap', border: 0 } as const;
