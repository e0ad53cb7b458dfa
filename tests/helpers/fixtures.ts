/** The fixed "today" the seeded test template is built for, so seeded tests see the same rows. */
export const SEED_TODAY = new Date('2026-11-18T15:00:00Z');

declare module 'vitest' {
  export interface ProvidedContext {
    /** Tarball of a PGlite data dir with every migration applied and nothing else. */
    emptyTemplatePath: string;
    /** The same with the demo seed for SEED_TODAY. */
    seededTemplatePath: string;
  }
}
