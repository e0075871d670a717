import type { PropsWithChildren } from 'react';

/**
 * The HTML page around every route the web build renders (web.output "static"; the single-page
 * export used public/index.html, whose head this repeats). Runs at build time only, in Node.
 * The styles are public/index.html's: the react-native-web root reset and the boot screen, which
 * server/bootstrap/web-finish.ts puts in the app shell served for every page but the landing page.
 */
export default function Root({ children }: PropsWithChildren) {
  return (
    <html lang="en">
      <head>
        <meta charSet="utf-8" />
        <meta httpEquiv="X-UA-Compatible" content="IE=edge" />
        <meta name="viewport" content="width=device-width, initial-scale=1, shrink-to-fit=no" />
        <title>Rotaloom</title>
        <meta
          name="description"
          content="Rosters for shift-based teams: coordinators plan them, staff read their shifts on their phones, also offline."
        />
        <meta name="theme-color" content="#1F4E4A" />
        <link rel="manifest" href="/manifest.webmanifest" />
        <link rel="icon" type="image/png" sizes="32x32" href="/icons/favicon-32.png" />
        <link rel="icon" type="image/svg+xml" href="/icons/icon.svg" />
        <link rel="apple-touch-icon" href="/icons/apple-touch-icon.png" />
        <meta name="apple-mobile-web-app-title" content="Rotaloom" />
        <meta name="mobile-web-app-capable" content="yes" />
        <style id="rotaloom-reset" dangerouslySetInnerHTML={{ __html: RESET }} />
      </head>
      <body>
        <noscript>Rotaloom needs JavaScript to run.</noscript>
        {children}
      </body>
    </html>
  );
}

const RESET = `
html, body { height: 100%; }
body { overflow: hidden; margin: 0; background: #f6f1e7; }
#root { display: flex; height: 100%; flex: 1; }
.boot { flex: 1; display: flex; flex-direction: column; align-items: center; justify-content: center; gap: 12px; color: #1f4e4a; font-family: 'AtkinsonHyperlegible', system-ui, sans-serif; }
.boot b { font-family: 'Fraunces-SemiBold', Georgia, serif; font-weight: 600; font-size: 32px; }
`;
