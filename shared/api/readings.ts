import { z } from 'zod';

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
export const QuantitySchema = z.enum(QUANTITIES);
export type Quantity = z.infer<typeof QuantitySchema>;

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

export const VERDICTS = ['pass', 'warn', 'fail'] as const;
export const VerdictSchema = z.enum(VERDICTS);
export type Verdict = z.infer<typeof VerdictSchema>;

export const CHECK_RUN_STATUSES = ['in_progress', 'paused', 'finished', 'abandoned'] as const;
export const CheckRunStatusSchema = z.enum(CHECK_RUN_STATUSES);
