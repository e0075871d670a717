/**
 * The names the web build writes and the server reads (server/bootstrap/web-finish.ts writes
 * them, server/web/static.ts serves them). Here rather than in web-finish.ts, which pulls in
 * workbox-build, so the server loads only these few lines.
 */

/** The page every address but the landing page gets (server/web/static.ts, the service worker). */
export const APP_SHELL = 'app-shell.html';

/** The page unknown addresses get with their 404 (server/web/static.ts). */
export const NOT_FOUND_PAGE = 'not-found.html';

/** The app's routes as the build found them. A dotfile: express.static does not serve it. */
export const ROUTES_FILE = '.rotaloom-routes.json';

/** What a browser may be sent Brotli-compressed: text, and the fonts (TrueType shrinks by half). */
export const PRECOMPRESSED = /\.(js|html|css|json|webmanifest|svg|ttf)$/;
