/** The guided checks Vanbay ships, by key. */
import { batteryCharging } from './battery-charging';
import { compression } from './compression';
import { fuelDelivery } from './fuel-delivery';
import type { ProcedureDefinition } from './types';

export const PROCEDURES = {
  'fuel-delivery': fuelDelivery,
  'battery-charging': batteryCharging,
  compression,
} as const satisfies Record<string, ProcedureDefinition>;

export type ProcedureKey = keyof typeof PROCEDURES;
export const PROCEDURE_KEYS = Object.keys(PROCEDURES) as ProcedureKey[];

/** Short names the CLI accepts: `vanbay check run JOB fuel`. */
const ALIASES: Record<string, ProcedureKey> = { fuel: 'fuel-delivery', battery: 'battery-charging' };

export function findProcedure(name: string): ProcedureDefinition | null {
  const key = (ALIASES[name] ?? name) as ProcedureKey;
  return key in PROCEDURES ? PROCEDURES[key] : null;
}
