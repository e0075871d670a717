/**
 * A content hash in a file name (Expo's export names bundles and assets that way):
 * `entry-3f2a9c…e1.js`, `font.9b8c…47.ttf`. Such a file never changes under its name.
 */
export const HASHED_FILE = /[.-][0-9a-f]{16,}\.[a-z0-9]+$/i;
