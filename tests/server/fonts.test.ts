/**
 * The shipped WOFF fonts turned back into plain sfnt files once per process (server/pdf/fonts.ts).
 * Checked against the two specifications, read here with this test's own parser:
 * - WOFF File Format 1.0, W3C Recommendation 13 December 2012: §3 the 44-byte header (signature
 *   'wOFF', flavor, numTables, totalSfntSize), §4 the 20-byte table directory entries (tag,
 *   offset, compLength, origLength, origChecksum), §5 tables zlib-compressed when compLength <
 *   origLength;
 * - OpenType (ISO/IEC 14496-22), "Organization of an OpenType Font": the 12-byte table directory
 *   (sfntVersion, numTables, searchRange, entrySelector, rangeShift), 16-byte table records
 *   sorted by tag, each table 4-byte aligned, the table checksum (the sum of its big-endian
 *   uint32s), and the `head` table (magicNumber 0x5F0F3CF5; checksumAdjustment set so the whole
 *   font sums to 0xB1B0AFBA, and taken as 0 in head's own checksum).
 * Then pdf.js, an independent PDF and font reader, reads a document set in the converted font
 * exactly as one set in the WOFF.
 */
import PDFDocument from 'pdfkit';
import { describe, expect, it } from 'vitest';
import {
  FONT_BOLD,
  FONT_REGULAR,
  registerFonts,
  spaceGrotesk,
  spaceGroteskWoff,
  woffToSfnt,
} from '../../server/pdf/fonts';
import { getDocument } from 'pdfjs-dist/legacy/build/pdf.mjs';

/** Each piece of text pdf.js finds, with the width it works out from the embedded font's metrics. */
async function textRuns(bytes: Buffer) {
  const pdf = await getDocument({ data: new Uint8Array(bytes), disableFontFace: true }).promise;
  const page = await pdf.getPage(1);
  const content = await page.getTextContent();
  const runs = content.items.flatMap((item) =>
    'str' in item && item.str.trim() !== ''
      ? [{ text: item.str, width: Math.round(item.width * 1000) / 1000 }]
      : [],
  );
  await pdf.destroy();
  return runs;
}

/** The table checksum as OpenType defines it, written out independently of the code under test. */
function checksum(bytes: Buffer): number {
  const padded = Buffer.alloc(Math.ceil(bytes.length / 4) * 4);
  bytes.copy(padded);
  let sum = 0n;
  for (let i = 0; i < padded.length; i += 4) sum += BigInt(padded.readUInt32BE(i));
  return Number(sum % 2n ** 32n);
}

function readWoff(woff: Buffer) {
  return {
    signature: woff.toString('latin1', 0, 4),
    flavor: woff.readUInt32BE(4),
    numTables: woff.readUInt16BE(12),
    totalSfntSize: woff.readUInt32BE(16),
    tables: Array.from({ length: woff.readUInt16BE(12) }, (_, i) => {
      const at = 44 + i * 20;
      return {
        tag: woff.toString('latin1', at, at + 4),
        compLength: woff.readUInt32BE(at + 8),
        origLength: woff.readUInt32BE(at + 12),
        origChecksum: woff.readUInt32BE(at + 16),
      };
    }),
  };
}

function readSfnt(sfnt: Buffer) {
  const numTables = sfnt.readUInt16BE(4);
  return {
    sfntVersion: sfnt.readUInt32BE(0),
    numTables,
    searchRange: sfnt.readUInt16BE(6),
    entrySelector: sfnt.readUInt16BE(8),
    rangeShift: sfnt.readUInt16BE(10),
    records: Array.from({ length: numTables }, (_, i) => {
      const at = 12 + i * 16;
      return {
        tag: sfnt.toString('latin1', at, at + 4),
        checksum: sfnt.readUInt32BE(at + 4),
        offset: sfnt.readUInt32BE(at + 8),
        length: sfnt.readUInt32BE(at + 12),
      };
    }),
  };
}

const weights = Object.entries(spaceGroteskWoff()) as [string, Buffer][];

describe.each(weights)('Space Grotesk %s, from WOFF to sfnt', (weight, woff) => {
  const sfnt = spaceGrotesk()[weight as 'regular' | 'bold'];
  const source = readWoff(woff);
  const font = readSfnt(sfnt);

  it('starts from a WOFF 1.0 file of a TrueType font that compresses its tables', () => {
    expect(source.signature).toBe('wOFF');
    expect(source.flavor).toBe(0x00010000);
    expect(source.tables.some((table) => table.compLength < table.origLength)).toBe(true);
  });

  it('has the table directory OpenType prescribes for its number of tables', () => {
    expect(font.sfntVersion).toBe(source.flavor);
    expect(font.numTables).toBe(source.numTables);
    // searchRange = 16 × the largest power of 2 ≤ numTables; entrySelector = its log2;
    // rangeShift = 16 × numTables − searchRange. For 15 tables, by hand: 16 × 8 = 128, 3, 240 − 128 = 112.
    const power = 2 ** Math.floor(Math.log2(font.numTables));
    expect(font.searchRange).toBe(16 * power);
    expect(font.entrySelector).toBe(Math.log2(power));
    expect(font.rangeShift).toBe(16 * font.numTables - font.searchRange);
    if (font.numTables === 15)
      expect([font.searchRange, font.entrySelector, font.rangeShift]).toEqual([128, 3, 112]);
  });

  it('comes to the size the WOFF header says the font had', () => {
    expect(sfnt.length).toBe(source.totalSfntSize);
  });

  it('lays every table out sorted, aligned, apart and whole', () => {
    const tags = font.records.map((r) => r.tag);
    expect(tags).toEqual([...tags].sort());
    expect(tags).toEqual(
      expect.arrayContaining(['cmap', 'glyf', 'head', 'hhea', 'hmtx', 'loca', 'maxp', 'name', 'post']),
    );
    let end = 12 + 16 * font.numTables;
    for (const record of [...font.records].sort((a, b) => a.offset - b.offset)) {
      expect(record.offset % 4, record.tag).toBe(0);
      expect(record.offset, record.tag).toBeGreaterThanOrEqual(end);
      end = record.offset + record.length;
      expect(end, record.tag).toBeLessThanOrEqual(sfnt.length);
      const original = source.tables.find((t) => t.tag === record.tag)!;
      expect(record.length, record.tag).toBe(original.origLength);
    }
  });

  it('holds each table as the original font had it: its checksum is the WOFF’s origChecksum', () => {
    for (const record of font.records) {
      const table = Buffer.from(sfnt.subarray(record.offset, record.offset + record.length));
      if (record.tag === 'head') table.writeUInt32BE(0, 8);
      const original = source.tables.find((t) => t.tag === record.tag)!;
      expect(checksum(table), record.tag).toBe(original.origChecksum);
      expect(record.checksum, record.tag).toBe(original.origChecksum);
    }
  });

  it('sums to 0xB1B0AFBA as a whole, through head’s checksumAdjustment', () => {
    const head = font.records.find((r) => r.tag === 'head')!;
    expect(sfnt.readUInt32BE(head.offset + 12)).toBe(0x5f0f3cf5);
    expect(checksum(sfnt)).toBe(0xb1b0afba);
  });
});

describe('woffToSfnt refuses what is not a sound WOFF', () => {
  const { regular } = spaceGroteskWoff();

  it('refuses a file without the signature', () => {
    expect(() => woffToSfnt(spaceGrotesk().regular)).toThrow(/wOFF signature/);
  });

  it('refuses a table whose bytes were damaged', () => {
    const damaged = Buffer.from(regular);
    const glyf = readWoff(damaged).tables.findIndex((t) => t.tag === 'glyf');
    const at = damaged.readUInt32BE(44 + glyf * 20 + 4);
    const length = damaged.readUInt32BE(44 + glyf * 20 + 8);
    const middle = at + (length >> 1);
    damaged[middle] = damaged[middle]! ^ 0xff;
    expect(() => woffToSfnt(damaged)).toThrow();
  });
});

/** A Letter page with one line in each weight, its fonts registered by `register`. */
function onePage(register: (doc: PDFKit.PDFDocument) => void): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    const doc = new PDFDocument({ size: 'LETTER', margin: 48 });
    const chunks: Buffer[] = [];
    doc.on('data', (chunk: Buffer) => chunks.push(chunk));
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
    register(doc);
    doc.font(FONT_REGULAR).fontSize(12).text('Invoice 1042: fuel filter, 43 psi at 3 bar.');
    doc.font(FONT_BOLD).fontSize(18).text('Balance due $1,471.45');
    doc.end();
  });
}

describe('PDFs set in the converted font', () => {
  it('embed it as a TrueType font file, once per weight', async () => {
    const pdf = (await onePage(registerFonts)).toString('latin1');
    // PDF 1.7 (ISO 32000-1) §9.9: an embedded TrueType font program is a FontFile2 stream; a
    // subset is named with a six-letter tag and a plus sign (§9.6.4).
    expect(pdf.match(/\/FontFile2/g)).toHaveLength(2);
    // pdfkit writes each as a Type0 font over a CIDFontType2 (§9.7), both naming the subset.
    const names = new Set(pdf.match(/\/BaseFont \/[A-Z]{6}\+SpaceGrotesk[-A-Za-z]*/g));
    expect(names.size).toBe(2);
  });

  it('read back with the same text and the same glyph widths as the WOFF gave', async () => {
    const woff = spaceGroteskWoff();
    const fromWoff = await textRuns(
      await onePage((doc) => {
        doc.registerFont(FONT_REGULAR, woff.regular);
        doc.registerFont(FONT_BOLD, woff.bold);
      }),
    );
    const fromSfnt = await textRuns(await onePage(registerFonts));
    expect(fromSfnt).toEqual(fromWoff);
    expect(fromSfnt.map((run) => run.text)).toEqual([
      'Invoice 1042: fuel filter, 43 psi at 3 bar.',
      'Balance due $1,471.45',
    ]);
    for (const run of fromSfnt) expect(run.width).toBeGreaterThan(0);
  });
});
