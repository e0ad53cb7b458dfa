/**
 * Which cached answers belong to the person signed in. Everything does, unless its query says
 * otherwise with this meta: when one person signs out and the next signs in on the same screen,
 * nothing of the first may still be showing.
 */
export const PUBLIC_QUERY_META = { public: true } as const;

/** True unless the query is marked public (the same answer for anyone, signed in or not). */
export function holdsPersonalData(query: { meta?: Record<string, unknown> | undefined }): boolean {
  return query.meta?.['public'] !== true;
}
