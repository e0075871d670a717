import { createElement, useEffect, useRef, useState, type MouseEvent } from 'react';
import { colors, fonts, radius, space } from '@/constants/theme';
import { fetchDownload } from './download-link-fetch';

type State = { kind: 'idle' } | { kind: 'fetching' } | { kind: 'preparing' } | { kind: 'failed'; message: string };

/** Saves a URL (a blob's or the API's) under a name, as a click on an <a download> does. */
function save(url: string, filename: string) {
  const a = document.createElement('a');
  a.href = url;
  a.download = filename;
  a.style.display = 'none';
  document.body.appendChild(a);
  a.click();
  a.remove();
}

/**
 * A download link for an API export. A small file comes at once; a large one is made by a worker
 * (the API answers 202), so the link says it is preparing the file until it is ready, then saves
 * it. The address stays a real link: opening it in a new tab, or a modified click, is the browser's.
 */
export function DownloadLink({ href, filename, label, a11yLabel, testID }: { href: string; filename: string; label: string; a11yLabel?: string; testID?: string }) {
  const [state, setState] = useState<State>({ kind: 'idle' });
  const abort = useRef<AbortController | null>(null);
  useEffect(() => () => abort.current?.abort(), []);

  const onClick = (e: MouseEvent) => {
    if (e.button !== 0 || e.metaKey || e.ctrlKey || e.shiftKey || e.altKey) return;
    e.preventDefault();
    if (state.kind === 'fetching' || state.kind === 'preparing') return;
    abort.current = new AbortController();
    setState({ kind: 'fetching' });
    fetchDownload(href, { signal: abort.current.signal, onPreparing: () => setState({ kind: 'preparing' }) })
      .then((got) => {
        if (got.kind === 'file') {
          const url = URL.createObjectURL(got.blob);
          save(url, got.filename ?? filename);
          // The click has handed the blob to the download by the next task.
          setTimeout(() => URL.revokeObjectURL(url), 10_000);
        } else save(got.url, got.filename ?? filename);
        setState({ kind: 'idle' });
      })
      .catch((err: unknown) => {
        if (err instanceof DOMException && err.name === 'AbortError') return;
        setState({ kind: 'failed', message: err instanceof Error ? err.message : String(err) });
      });
  };

  const busy = state.kind === 'fetching' || state.kind === 'preparing';
  const link = createElement(
    'a',
    {
      href,
      download: filename,
      onClick,
      'aria-label': state.kind === 'preparing' ? `${a11yLabel ?? label}: preparing the file` : (a11yLabel ?? label),
      'aria-busy': busy || undefined,
      'data-testid': testID,
      'data-state': state.kind,
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
        cursor: busy ? 'progress' : 'pointer',
      },
    },
    state.kind === 'preparing' ? `Preparing ${label}…` : label,
  );
  if (state.kind === 'idle' || state.kind === 'fetching') return link;
  const note =
    state.kind === 'preparing'
      ? createElement('span', { role: 'status', 'data-testid': testID ? `${testID}-note` : undefined, style: { fontFamily: fonts.body, fontSize: 14, color: colors.ink } }, 'A large file: it is being made and will download by itself in a few seconds.')
      : createElement('span', { role: 'alert', 'data-testid': testID ? `${testID}-note` : undefined, style: { fontFamily: fonts.body, fontSize: 14, color: colors.ink } }, state.message);
  return createElement('span', { style: { display: 'inline-flex', flexDirection: 'column', gap: space.xs, maxWidth: 360 } }, link, note);
}
