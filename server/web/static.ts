import express, { Router } from 'express';
import { existsSync } from 'node:fs';
import path from 'node:path';
import { HASHED_FILE } from './hashed';

/**
 * Serves the exported web app. The export is a single-page app, so any GET that is not a file
 * or an API call gets index.html and the client router decides (including its not-found page).
 */
export function webRouter(webDir: string): Router {
  const router = Router();
  const indexFile = path.join(webDir, 'index.html');
  router.use(express.static(webDir, { index: false, setHeaders: cacheHeaders }));
  router.get('/{*splat}', (req, res, next) => {
    if (req.path.startsWith('/api/')) return next();
    if (!existsSync(indexFile)) {
      res.status(503).type('text/plain').send('The web app has not been built yet: run `npm start`, which builds it.');
      return;
    }
    res.setHeader('Cache-Control', 'no-cache');
    res.sendFile(indexFile);
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
