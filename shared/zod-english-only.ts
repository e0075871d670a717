// Stands in for zod's `locales/index.js` in the app bundle (metro.config.cjs): English only.
export { default as en } from 'zod/v4/locales/en.js';
