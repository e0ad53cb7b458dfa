import { z } from 'zod';

export const MACHINE_KINDS = [
  'motorcycle',
  'atv',
  'side_by_side',
  'snowmobile',
  'watercraft',
  'small_engine',
] as const;
export const MachineKindSchema = z.enum(MACHINE_KINDS);
export type MachineKind = z.infer<typeof MachineKindSchema>;

/** How a machine counts its use: road machines by distance, most off-road and marine ones by hours. */
export const METER_UNITS = ['mi', 'km', 'h'] as const;
export const MeterUnitSchema = z.enum(METER_UNITS);
export type MeterUnit = z.infer<typeof MeterUnitSchema>;

/** Where a spec came from: the machine's service manual, or Vanbay's generic default. */
export const SPEC_SOURCES = ['manual', 'generic'] as const;
export const SpecSourceSchema = z.enum(SPEC_SOURCES);
