import type { MachineKind, MeterUnit } from '../../../../shared/api/machines';
import { formatDecimal } from '../../../lib/format';

export const MACHINE_KIND_LABELS: Record<MachineKind, string> = {
  motorcycle: 'Motorcycle',
  atv: 'ATV',
  side_by_side: 'Side-by-side',
  snowmobile: 'Snowmobile',
  watercraft: 'Personal watercraft',
  small_engine: 'Small engine',
};

export const METER_UNIT_LABELS: Record<MeterUnit, string> = {
  mi: 'Miles (odometer)',
  km: 'Kilometres (odometer)',
  h: 'Engine hours',
};

/** "18,420 mi", "312 h"; null when nothing was read. */
export function meterText(reading: number | null, unit: MeterUnit): string | null {
  return reading === null ? null : `${formatDecimal(reading, 1)} ${unit}`;
}
