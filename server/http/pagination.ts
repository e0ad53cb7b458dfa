/**
 * Keyset pagination over ids: the cursor is the last id of a page (opaque to clients), so a page
 * never shifts when rows are added while someone pages.
 */
import { BadRequestError } from '../errors';
import type { ListResponse } from '../../shared/api/common';

export function decodeCursor(cursor: string | undefined): number | null {
  if (cursor === undefined) return null;
  const id = Number(Buffer.from(cursor, 'base64url').toString('utf8').replace(/^id:/, ''));
  if (!Number.isInteger(id) || id <= 0) throw new BadRequestError('Invalid cursor');
  return id;
}

export function encodeCursor(id: number): string {
  return Buffer.from(`id:${id}`, 'utf8').toString('base64url');
}

/** Rows fetched with `limit + 1` become a page and the cursor to the next one. */
export function toPage<R extends { id: number }, T>(
  rows: R[],
  limit: number,
  map: (row: R) => T,
): ListResponse<T> {
  const page = rows.slice(0, limit);
  const last = page.at(-1);
  return { items: page.map(map), nextCursor: rows.length > limit && last ? encodeCursor(last.id) : null };
}
