import { createElement } from 'react';
import { colors, fonts, radius, space } from '@/constants/theme';

/** A plain <a download>: the browser saves the file from the API with the session cookie. */
export function DownloadLink({ href, filename, label, a11yLabel, testID }: { href: string; filename: string; label: string; a11yLabel?: string; testID?: string }) {
  return createElement(
    'a',
    {
      href,
      download: filename,
      'aria-label': a11yLabel ?? label,
      'data-testid': testID,
      style: {
        display: 'inline-flex',
        alignItems: 'center',
        minHeight: 44,
        padding: `0 ${space.md}px`,
        borderRadius: radius.sm,
        border: `1px solid ${colors.line}`,
        background: colors.white,
        color: colors.loom,
        fontFamily: fonts.bodyBold,
        fontSize: 15,
        textDecoration: 'none',
        boxSizing: 'border-box',
      },
    },
    label,
  );
}
