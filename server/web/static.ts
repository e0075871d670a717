import express, { Router, type Request, type Response } from 'express';
import { existsSync, readFileSync, statSync } from 'node:fs';
import path from 'node:path';
import { HASHED_FILE } from './hashed';
import { APP_SHELL, NOT_FOUND_PAGE, PRECOMPRESSED, ROUTES_FILE } from './build-files';

/**
 * Serves the exported web app. The landing page gets index.html, which the build rendered with its
 * sign-in form (the client hydrates it); any other address of the app gets the app shell and the
 * client router draws it. An address that is neither an app route nor a file (a mistyped link, a
 * chunk of an earlier build) gets 404 with the not-found page. An export without the build's route
 * list (single-page output, tests) answers every address with its shell, or index.html.
 */
export function webRouter(webDir: string): Router {
  const router = Router();
  const indexFile = path.join(webDir, 'index.html');
  const shellFile = path.join(webDir, APP_SHELL);
  router.use((req, res, next) => {
    if ((req.method === 'GET' || req.method === 'HEAD') && !req.path.startsWith('/api/') && sendBrotli(req, res, webDir, req.path)) return;
    next();
  });
  // redirect: false — the static export has folders named like routes (rosters/), which must not become /rosters/
  router.use(express.static(webDir, { index: false, redirect: false, setHeaders: cacheHeaders }));
  router.get('/{*splat}', (req, res, next) => {
    if (req.path.startsWith('/api/')) return next();
    if (!existsSync(indexFile)) {
      res.status(503).type('text/plain').send('The web app has not been built yet: run `npm start`, which builds it.');
      return;
    }
    let page = req.path === '/' || !existsSync(shellFile) ? 'index.html' : APP_SHELL;
    if (req.path !== '/' && !isAppAddress(webDir, req.path)) {
      res.status(404);
      if (existsSync(path.join(webDir, NOT_FOUND_PAGE))) page = NOT_FOUND_PAGE;
    }
    if (sendBrotli(req, res, webDir, `/${page}`)) return;
    res.setHeader('Cache-Control', 'no-cache');
    res.sendFile(path.join(webDir, page));
  });
  return router;
}

const routeLists = new Map<string, { mtimeMs: number; patterns: RegExp[] }>();

/**
 * Whether a path is one of the app's routes, by the list the build wrote
 * (server/bootstrap/web-finish.ts `routeTable`); read again when a new build replaces it.
 * Without a list every path counts as one.
 */
function isAppAddress(webDir: string, urlPath: string): boolean {
  const file = path.join(webDir, ROUTES_FILE);
  let mtimeMs: number;
  try {
    mtimeMs = statSync(file).mtimeMs;
  } catch {
    return true;
  }
  let list = routeLists.get(file);
  if (!list || list.mtimeMs !== mtimeMs) {
    const { routes } = JSON.parse(readFileSync(file, 'utf8')) as { routes: Array<{ pattern: string }> };
    list = { mtimeMs, patterns: routes.map((r) => new RegExp(r.pattern)) };
    routeLists.set(file, list);
  }
  let decoded: string;
  try {
    decoded = decodeURIComponent(urlPath);
  } catch {
    return false;
  }
  return list.patterns.some((p) => p.test(decoded));
}

/**
 * Hashed build files never change under their name, so browsers may keep them a year without
 * asking; everything else (HTML, the manifest, unhashed files) is revalidated on each use.
 */
export function cacheControlFor(filePath: string): string {
  return HASHED_FILE.test(path.basename(filePath)) ? 'public, max-age=31536000, immutable' : 'no-cache';
}

function cacheHeaders(res: express.Response, filePath: string): void {
  res.setHeader('Cache-Control', cacheControlFor(filePath));
}

/**
 * The build's Brotli copy of a file (server/bootstrap/web-finish.ts `precompress`), for a browser
 * that accepts it; the compression middleware leaves an answer that already has an encoding alone.
 */
function sendBrotli(req: Request, res: Response, webDir: string, urlPath: string): boolean {
  if (!PRECOMPRESSED.test(urlPath) || req.acceptsEncodings('br') !== 'br') return false;
  let rel: string;
  try {
    rel = decodeURIComponent(urlPath);
  } catch {
    return false;
  }
  const root = path.resolve(webDir);
  const file = path.resolve(root, `.${rel}`);
  // Dotfiles (the build's stamp and route list) are not served, as express.static does not.
  if (!file.startsWith(root + path.sep) || rel.split('/').some((seg) => seg.startsWith('.')) || !existsSync(`${file}.br`)) return false;
  res.setHeader('Content-Encoding', 'br');
  res.setHeader('Vary', 'Accept-Encoding');
  res.setHeader('Cache-Control', cacheControlFor(file));
  res.type(path.extname(file));
  res.sendFile(`${file}.br`);
  return true;
}
