import { getDocument } from 'pdfjs-dist/legacy/build/pdf.mjs';
import request from 'supertest';
import type { Express } from 'express';

/** GETs a binary answer (a PDF) in full: supertest parses only text and JSON by itself. */
export function getBinary(app: Express, path: string, headers: Record<string, string>) {
  return request(app)
    .get(path)
    .set(headers)
    .buffer(true)
    .parse((res, callback) => {
      const stream = res as unknown as NodeJS.ReadableStream;
      const chunks: Buffer[] = [];
      stream.on('data', (chunk: Buffer) => chunks.push(chunk));
      stream.on('end', () => callback(null, Buffer.concat(chunks)));
    });
}

export interface PdfPage {
  text: string;
  width: number;
  height: number;
}

/** Each page's text (pdf.js's reading of it) and its size in points. */
export async function readPdf(bytes: Buffer): Promise<PdfPage[]> {
  const pdf = await getDocument({ data: new Uint8Array(bytes), disableFontFace: true }).promise;
  const pages: PdfPage[] = [];
  for (let n = 1; n <= pdf.numPages; n += 1) {
    const page = await pdf.getPage(n);
    const { width, height } = page.getViewport({ scale: 1 });
    const content = await page.getTextContent();
    const text = content.items.map((item) => ('str' in item ? item.str : '')).join(' ');
    pages.push({ text, width, height });
  }
  await pdf.destroy();
  return pages;
}

/** Text compared without its white space, so a wrapped line still reads as one string. */
export const squash = (text: string) => text.replace(/\s+/g, '');
