/**
 * The typeface every Vanbay PDF is set in: Space Grotesk, shipped with the app (STYLE.md), so a
 * document looks the same on every machine. The .woff files are read, not .woff2: pdfkit's font
 * subsetter cannot read woff2. Paths are resolved through the package, so any working directory works.
 *
 * pdfkit hands a WOFF to fontkit, which inflates every table again for each document in pure
 * JavaScript (the larger part of an invoice's render time). So each WOFF is turned back into the
 * plain sfnt (TrueType or CFF) it was made from, once per process with node:zlib, and that is
 * what the documents register.
 */
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { inflateSync } from 'node:zlib';

const require = createRequire(import.meta.url);

export const FONT_REGULAR = 'SpaceGrotesk';
export const FONT_BOLD = 'SpaceGrotesk-Bold';

function fontFile(weight: 400 | 700): string {
  return require.resolve(`@fontsource/space-grotesk/files/space-grotesk-latin-${weight}-normal.woff`);
}

/** WOFF 1.0 (W3C Recommendation, 13 December 2012), §3 header and §4 table directory. */
const WOFF_SIGNATURE = 0x774f4646; // 'wOFF'
const WOFF_HEADER_SIZE = 44;
const WOFF_ENTRY_SIZE = 20;
/** OpenType (ISO/IEC 14496-22), "Organization of an OpenType Font": table directory and records. */
const SFNT_HEADER_SIZE = 12;
const SFNT_RECORD_SIZE = 16;
/** The `head` table's checksumAdjustment makes the whole font sum to this (OpenType, `head`). */
const SFNT_CHECKSUM_MAGIC = 0xb1b0afba;
const HEAD_ADJUSTMENT_OFFSET = 8;

const pad4 = (n: number) => (n + 3) & ~3;

/** The OpenType table checksum: the sum of the big-endian uint32s, the last one zero-padded. */
export function sfntChecksum(bytes: Uint8Array): number {
  let sum = 0;
  for (let i = 0; i < bytes.length; i += 4) {
    const word =
      ((bytes[i] ?? 0) << 24) |
      ((bytes[i + 1] ?? 0) << 16) |
      ((bytes[i + 2] ?? 0) << 8) |
      (bytes[i + 3] ?? 0);
    sum = (sum + (word >>> 0)) >>> 0;
  }
  return sum;
}

/**
 * The sfnt a WOFF 1.0 file was made from: the flavor as sfnt version, one record per table in tag
 * order, each table inflated (zlib) where its compLength is below its origLength and stored as it
 * is where they are equal, each on a 4-byte boundary. The records carry the WOFF's origChecksum
 * (the table's checksum in the original font) after checking it against the inflated bytes, and
 * `head`'s checksumAdjustment is worked out again for this layout. Throws on anything that is not
 * a well-formed WOFF 1.0 file.
 */
export function woffToSfnt(woff: Buffer): Buffer {
  if (woff.length < WOFF_HEADER_SIZE || woff.readUInt32BE(0) !== WOFF_SIGNATURE) {
    throw new Error('Not a WOFF 1.0 file (no wOFF signature)');
  }
  const flavor = woff.readUInt32BE(4);
  const numTables = woff.readUInt16BE(12);
  const totalSfntSize = woff.readUInt32BE(16);
  const tables = Array.from({ length: numTables }, (_, i) => {
    const at = WOFF_HEADER_SIZE + i * WOFF_ENTRY_SIZE;
    const entry = {
      tag: woff.readUInt32BE(at),
      offset: woff.readUInt32BE(at + 4),
      compLength: woff.readUInt32BE(at + 8),
      origLength: woff.readUInt32BE(at + 12),
      origChecksum: woff.readUInt32BE(at + 16),
    };
    const name = woff.toString('latin1', at, at + 4);
    if (entry.offset + entry.compLength > woff.length || entry.compLength > entry.origLength) {
      throw new Error(`WOFF table ${name} lies outside the file or is longer compressed than plain`);
    }
    const stored = woff.subarray(entry.offset, entry.offset + entry.compLength);
    const data = entry.compLength < entry.origLength ? inflateSync(stored) : stored;
    if (data.length !== entry.origLength) {
      throw new Error(`WOFF table ${name} inflates to ${data.length} bytes, not ${entry.origLength}`);
    }
    return { ...entry, name, data };
  });
  tables.sort((a, b) => a.tag - b.tag);

  const directorySize = SFNT_HEADER_SIZE + numTables * SFNT_RECORD_SIZE;
  const size = tables.reduce((n, table) => n + pad4(table.origLength), directorySize);
  const sfnt = Buffer.alloc(size);
  // searchRange, entrySelector, rangeShift: the binary-search helpers of the table directory.
  const entrySelector = numTables > 0 ? Math.floor(Math.log2(numTables)) : 0;
  const searchRange = 2 ** entrySelector * 16;
  sfnt.writeUInt32BE(flavor, 0);
  sfnt.writeUInt16BE(numTables, 4);
  sfnt.writeUInt16BE(searchRange, 6);
  sfnt.writeUInt16BE(entrySelector, 8);
  sfnt.writeUInt16BE(numTables * 16 - searchRange, 10);

  let offset = directorySize;
  let headOffset: number | null = null;
  for (const [i, table] of tables.entries()) {
    table.data.copy(sfnt, offset);
    // head's checksum is defined with checksumAdjustment taken as 0 (OpenType, `head`).
    const checked = Buffer.from(table.data);
    if (table.name === 'head') {
      checked.writeUInt32BE(0, HEAD_ADJUSTMENT_OFFSET);
      sfnt.writeUInt32BE(0, offset + HEAD_ADJUSTMENT_OFFSET);
      headOffset = offset;
    }
    if (sfntChecksum(checked) !== table.origChecksum) {
      throw new Error(`WOFF table ${table.name} does not match its origChecksum once inflated`);
    }
    const record = SFNT_HEADER_SIZE + i * SFNT_RECORD_SIZE;
    sfnt.writeUInt32BE(table.tag, record);
    sfnt.writeUInt32BE(table.origChecksum, record + 4);
    sfnt.writeUInt32BE(offset, record + 8);
    sfnt.writeUInt32BE(table.origLength, record + 12);
    offset += pad4(table.origLength);
  }
  if (size !== totalSfntSize) {
    throw new Error(`The sfnt comes to ${size} bytes, not the ${totalSfntSize} the WOFF header gives`);
  }
  if (headOffset !== null) {
    const adjustment = (SFNT_CHECKSUM_MAGIC - sfntChecksum(sfnt)) >>> 0;
    sfnt.writeUInt32BE(adjustment, headOffset + HEAD_ADJUSTMENT_OFFSET);
  }
  return sfnt;
}

let cache: { regular: Buffer; bold: Buffer } | undefined;

/** The two weights as plain sfnt bytes, read and converted once per process. */
export function spaceGrotesk(): { regular: Buffer; bold: Buffer } {
  cache ??= {
    regular: woffToSfnt(readFileSync(fontFile(400))),
    bold: woffToSfnt(readFileSync(fontFile(700))),
  };
  return cache;
}

/** The shipped files as they are, for the test that proves the conversion. */
export function spaceGroteskWoff(): { regular: Buffer; bold: Buffer } {
  return { regular: readFileSync(fontFile(400)), bold: readFileSync(fontFile(700)) };
}

/** Registers both weights on a document under FONT_REGULAR and FONT_BOLD. */
export function registerFonts(doc: PDFKit.PDFDocument): void {
  const { regular, bold } = spaceGrotesk();
  doc.registerFont(FONT_REGULAR, regular);
  doc.registerFont(FONT_BOLD, bold);
}
