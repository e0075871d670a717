import express, { Router } from 'express';
import { existsSync } from 'node:fs';
import path from 'node:path';
import { HASHED_FILE } from './hashed';

/** As server/bootstrap/web-finish.ts names it (not imported: that module pulls in workbox-build). */
const APP_SHELL = 'app-shell.html';

/**
 * Serves the exported web app. The landing page gets index.html, which the build rendered with its
 * sign-in form (the client hydrates it); any other GET that is not a file or an API call gets the
 * app shell and the client router decides (including its not-found page). An export without a
 * shell (older builds, tests) answers everything with index.html.
 */
export function webRouter(webDir: string): Router {
  const router = Router();
  const indexFile = path.join(webDir, 'index.html');
  const shellFile = path.join(webDir, APP_SHELL);
  // redirect: false — the static export has folders named like routes (rosters/), which must not become /rosters/
  router.use(express.static(webDir, { index: false, redirect: false, setHeaders: cacheHeaders }));
  router.get('/{*splat}', (req, res, next) => {
    if (req.path.startsWith('/api/')) return next();
    if (!existsSync(indexFile)) {
      res.status(503).type('text/plain').send('The web app has not been built yet: run `npm start`, which builds it.');
      return;
    }
    res.setHeader('Cache-Control', 'no-cache');
    res.sendFile(req.path === '/' || !existsSync(shellFile) ? indexFile : shellFile);
  });
  return router;
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
