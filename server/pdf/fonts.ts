/**
 * The typeface every Vanbay PDF is set in: Space Grotesk, shipped with the app (STYLE.md), so a
 * document looks the same on every machine. The .woff files are used, not .woff2: pdfkit's font
 * subsetter cannot read woff2. Paths are resolved through the package, so any working directory works.
 */
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';

const require = createRequire(import.meta.url);

export const FONT_REGULAR = 'SpaceGrotesk';
export const FONT_BOLD = 'SpaceGrotesk-Bold';

function fontFile(weight: 400 | 700): string {
  return require.resolve(`@fontsource/space-grotesk/files/space-grotesk-latin-${weight}-normal.woff`);
}

let cache: { regular: Buffer; bold: Buffer } | undefined;

/** The two weights' bytes, read once per process. */
export function spaceGrotesk(): { regular: Buffer; bold: Buffer } {
  cache ??= { regular: readFileSync(fontFile(400)), bold: readFileSync(fontFile(700)) };
  return cache;
}

/** Registers both weights on a document under FONT_REGULAR and FONT_BOLD. */
export function registerFonts(doc: PDFKit.PDFDocument): void {
  const { regular, bold } = spaceGrotesk();
  doc.registerFont(FONT_REGULAR, regular);
  doc.registerFont(FONT_BOLD, bold);
}
