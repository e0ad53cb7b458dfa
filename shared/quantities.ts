/**
 * What the mechanic measures and the unit each is stored in, without zod: the CLI's `calc` and
 * `--help` load this (through `units.ts`) and never initialise the schemas. `api/readings.ts`
 * re-exports it beside the schemas built from it.
 */

/** What the mechanic measures (CONTRACT.md, `vanbay reading add`), plus the few the checks need. */
export const QUANTITIES = [
  'pressure',
  'voltage',
  'flow',
  'compression',
  'afr',
  'resistance',
  'duration',
  'volume',
  'temperature',
] as const;
export type Quantity = (typeof QUANTITIES)[number];

/**
 * The unit each quantity is stored in. Readings keep the unit the mechanic typed beside the
 * canonical value, so it can be shown back as entered.
 */
export const CANONICAL_UNITS = {
  pressure: 'kPa',
  voltage: 'V',
  flow: 'L/h',
  compression: 'kPa',
  afr: 'ratio',
  resistance: 'ohm',
  duration: 's',
  volume: 'mL',
  temperature: 'C',
} as const satisfies Record<Quantity, string>;
