/**
 * Rotaloom's look: warm paper, deep loom-green ink and an ochre thread for actions. In a file of
 * its own so Node scripts (the icon drawing) can read it without the font files theme.ts requires.
 */
export const colors = {
  paper: '#F6F1E7',
  card: '#FFFDF8',
  ink: '#1D2B2A',
  inkSoft: '#4A5857',
  loom: '#1F4E4A',
  loomSoft: '#D9E6E1',
  thread: '#B85F1E',
  threadSoft: '#F3DEC9',
  line: '#D8D0C0',
  danger: '#A3262A',
  dangerSoft: '#F7DEDC',
  ok: '#2E6B3A',
  white: '#FFFFFF',
} as const;
