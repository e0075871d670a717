/**
 * Draws Rotaloom's app icons (our own: three warp threads crossed by one weft, the wordmark's
 * threads) and writes them to public/icons/: the SVG, and PNGs in the sizes browsers and phones
 * ask a web app manifest for; and public/favicon.ico, which browsers ask for on any page that names
 * no icon (the development mail page, the server's own plain pages). Rasterised by the Chromium the browser tests use, so nothing is
 * downloaded. Run after changing the drawing: `npx tsx scripts/draw-icons.ts`; the PNGs are
 * committed, so builds do not need a browser.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { chromium } from 'playwright-core';
import { colors } from '../constants/colors';

const PUBLIC = path.resolve(import.meta.dirname, '..', 'public');
const OUT = path.join(PUBLIC, 'icons');

/**
 * An ICO file holding one PNG image (the ICO format's PNG entries, read by every current browser):
 * a 6-byte header (reserved 0, type 1 = icon, one image), a 16-byte directory entry (width,
 * height, no palette, 1 plane, 32 bits, the PNG's length and its offset 22), then the PNG.
 */
export function icoFromPng(png: Buffer, size: number): Buffer {
  const head = Buffer.alloc(22);
  head.writeUInt16LE(0, 0);
  head.writeUInt16LE(1, 2);
  head.writeUInt16LE(1, 4);
  head.writeUInt8(size >= 256 ? 0 : size, 6);
  head.writeUInt8(size >= 256 ? 0 : size, 7);
  head.writeUInt8(0, 8);
  head.writeUInt8(0, 9);
  head.writeUInt16LE(1, 10);
  head.writeUInt16LE(32, 12);
  head.writeUInt32LE(png.length, 14);
  head.writeUInt32LE(22, 18);
  return Buffer.concat([head, png]);
}

/**
 * `corner` rounds the tile for icons shown as they are; maskable icons fill the square edge to
 * edge (the platform cuts its own shape) and keep the threads inside the central 80 % circle.
 */
export function iconSvg(corner: number): string {
  return `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 512 512" width="512" height="512">
  <rect width="512" height="512" rx="${corner}" fill="${colors.loom}"/>
  <rect x="172" y="136" width="44" height="240" rx="22" fill="${colors.thread}"/>
  <rect x="296" y="136" width="44" height="240" rx="22" fill="${colors.thread}"/>
  <rect x="140" y="234" width="232" height="44" rx="22" fill="${colors.threadSoft}"/>
  <rect x="234" y="176" width="44" height="160" rx="22" fill="${colors.paper}"/>
</svg>
`;
}

/** What the manifest and index.html name; 192 and 512 are the sizes Chromium needs to offer installing. */
const PNGS = [
  { file: 'icon-192.png', size: 192, corner: 96 },
  { file: 'icon-512.png', size: 512, corner: 96 },
  { file: 'icon-maskable-512.png', size: 512, corner: 0 },
  { file: 'apple-touch-icon.png', size: 180, corner: 0 },
  { file: 'favicon-32.png', size: 32, corner: 96 },
];

async function main() {
  mkdirSync(OUT, { recursive: true });
  writeFileSync(path.join(OUT, 'icon.svg'), iconSvg(96));
  const browser = await chromium.launch({ executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium', args: ['--headless', '--no-sandbox'] });
  try {
    for (const { file, size, corner } of PNGS) {
      const page = await browser.newPage({ viewport: { width: size, height: size }, deviceScaleFactor: 1 });
      const svg = iconSvg(corner).replace('width="512" height="512"', `width="${size}" height="${size}"`);
      await page.setContent(`<html><body style="margin:0;background:transparent">${svg}</body></html>`);
      const png = await page.screenshot({ omitBackground: true, clip: { x: 0, y: 0, width: size, height: size } });
      writeFileSync(path.join(OUT, file), png);
      if (file === 'favicon-32.png') writeFileSync(path.join(PUBLIC, 'favicon.ico'), icoFromPng(png, size));
      await page.close();
      console.log(`${file} ${size}×${size}`);
    }
  } finally {
    await browser.close();
  }
}

await main();
