import type { Machine, MachineSpecKey } from '../../../../shared/api/machines';
import { MACHINE_SPEC_LIMITS } from '../../../../shared/api/machines';
import { convert, formatMeasurement } from '../../../../shared/units';
import type { UnitId } from '../../../../shared/units';

/** The words every generic figure carries (DEVELOPERS.md, "Data rules"). */
export const GENERIC_SPEC_LABEL = 'generic — confirm in the service manual';

type SpecField = {
  key: MachineSpecKey;
  label: string;
  /** The unit the mechanic reads it in: a fuel gauge in psi. */
  shownIn: UnitId;
  example: string;
};

/** The fuel specs in the order a service manual's fuel chapter gives them. */
export const SPEC_FIELDS: readonly SpecField[] = [
  {
    key: 'fuelPressureMinKpa',
    label: 'Fuel pressure, lowest',
    shownIn: 'psi',
    example: '40 psi, 2.8 bar or 276 kPa',
  },
  {
    key: 'fuelPressureMaxKpa',
    label: 'Fuel pressure, highest',
    shownIn: 'psi',
    example: '46 psi or 3.2 bar',
  },
  { key: 'holdMaxDropKpa', label: 'Hold test, most pressure lost', shownIn: 'psi', example: '3 psi' },
  { key: 'holdMinutes', label: 'Hold test, how long', shownIn: 'min', example: '5 min' },
  { key: 'flowMinLph', label: 'Flow, least', shownIn: 'L/h', example: '30 L/h or 500 mL/min' },
];

export function specLabel(key: MachineSpecKey): string {
  return SPEC_FIELDS.find((field) => field.key === key)?.label ?? key;
}

/** A stored (canonical) spec in the mechanic's unit, as it goes back into the field: "40 psi". */
export function specInputText(key: MachineSpecKey, canonical: number): string {
  const field = SPEC_FIELDS.find((f) => f.key === key)!;
  return formatMeasurement(
    convert(canonical, MACHINE_SPEC_LIMITS[key].unit, field.shownIn),
    field.shownIn,
    1,
  );
}

/** A spec for reading: "40 psi (275.8 kPa)" for pressures, the stored unit alone otherwise. */
export function specText(key: MachineSpecKey, canonical: number): string {
  const stored = MACHINE_SPEC_LIMITS[key].unit;
  const shown = specInputText(key, canonical);
  const field = SPEC_FIELDS.find((f) => f.key === key)!;
  return field.shownIn === stored ? shown : `${shown} (${formatMeasurement(canonical, stored, 1)})`;
}

/** What a check on this machine judges against for `key`, and where that figure comes from. */
export function specInUse(machine: Machine, key: MachineSpecKey): { text: string; generic: boolean } {
  const spec = machine.specs[key];
  return { text: specText(key, spec.value), generic: spec.source === 'generic' };
}

/** The server names spec fields by their keys; the mechanic knows them by their labels. */
export function withSpecLabels(message: string): string {
  return SPEC_FIELDS.reduce((text, field) => text.replaceAll(field.key, `“${field.label}”`), message);
}
