import { StyleSheet } from 'react-native';
import { colors, fonts, radius, space } from '@/constants/theme';

/** A plain download link: the browser saves GET /api/people/export (the session cookie goes along). */
export function ExportLink() {
  return (
    <a href="/api/people/export" download="people.csv" style={linkStyle} data-testid="people-export" aria-label="Export people as CSV">
      Export CSV
    </a>
  );
}

const s = StyleSheet.flatten({ minHeight: 44, borderRadius: radius.md, paddingLeft: space.lg, paddingRight: space.lg, borderWidth: 1, borderColor: colors.line, color: colors.loom, fontFamily: fonts.bodyBold, fontSize: 15 });
const linkStyle = { ...s, display: 'inline-flex', alignItems: 'center', textDecoration: 'none', borderStyle: 'solid', boxSizing: 'border-box' } as const;
