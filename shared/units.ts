/**
 * Units the mechanic types and the canonical units Vanbay stores.
 *
 * The factors are written as the exact definitions they come from (NIST SP 811, Appendix B.8,
 * and the definitions of the pound, the inch and the US gallon) instead of rounded table values.
 * A general-purpose unit library was weighed and left out of the runtime: the small ones round
 * psi to six or seven digits (which drifts a stored kPa value away from the psi typed), and
 * mathjs, which is exact enough, would outweigh the whole dashboard. The tests check every factor
 * against mathjs and against NIST's printed figures.
 */
import { CANONICAL_UNITS, type Quantity } from './quantities';

export type Dimension =
  'pressure' | 'voltage' | 'volume' | 'flow' | 'distance' | 'temperature' | 'time' | 'resistance' | 'ratio';

/** 1 lbf = 0.453 592 37 kg × 9.806 65 m/s² (exact by definition; NIST SP 811 B.8). */
const NEWTONS_PER_LBF = 0.45359237 * 9.80665;
/** 1 in = 0.0254 m exactly. */
const METRES_PER_INCH = 0.0254;
/** 1 psi in kPa: 6.894 757 293 168… (NIST SP 811 B.8). */
export const KPA_PER_PSI = NEWTONS_PER_LBF / (METRES_PER_INCH * METRES_PER_INCH) / 1000;
/** 1 US gallon = 231 in³ = 3.785 411 784 L exactly. */
const ML_PER_US_GALLON = 231 * (METRES_PER_INCH * 100) ** 3;
/** 1 mile = 1.609 344 km exactly. */
const KM_PER_MILE = 1.609344;

interface LinearUnit {
  dimension: Dimension;
  /** How many base units (the dimension's canonical unit) one of this unit is. */
  factor: number;
  label: string;
}
interface AffineUnit {
  dimension: 'temperature';
  toBase: (value: number) => number;
  fromBase: (value: number) => number;
  label: string;
}
type UnitDefinition = LinearUnit | AffineUnit;

/** Every unit by its id; the base of each dimension has factor 1 and is the canonical unit. */
export const UNITS = {
  kPa: { dimension: 'pressure', factor: 1, label: 'kPa' },
  psi: { dimension: 'pressure', factor: KPA_PER_PSI, label: 'psi' },
  bar: { dimension: 'pressure', factor: 100, label: 'bar' },
  V: { dimension: 'voltage', factor: 1, label: 'V' },
  mV: { dimension: 'voltage', factor: 0.001, label: 'mV' },
  mL: { dimension: 'volume', factor: 1, label: 'mL' },
  L: { dimension: 'volume', factor: 1000, label: 'L' },
  gal: { dimension: 'volume', factor: ML_PER_US_GALLON, label: 'US gal' },
  floz: { dimension: 'volume', factor: ML_PER_US_GALLON / 128, label: 'US fl oz' },
  'L/h': { dimension: 'flow', factor: 1, label: 'L/h' },
  'mL/min': { dimension: 'flow', factor: 60 / 1000, label: 'mL/min' },
  'gal/h': { dimension: 'flow', factor: ML_PER_US_GALLON / 1000, label: 'US gal/h' },
  km: { dimension: 'distance', factor: 1, label: 'km' },
  mi: { dimension: 'distance', factor: KM_PER_MILE, label: 'mi' },
  C: { dimension: 'temperature', toBase: (c: number) => c, fromBase: (c: number) => c, label: '°C' },
  F: {
    dimension: 'temperature',
    toBase: (f: number) => ((f - 32) * 5) / 9,
    fromBase: (c: number) => (c * 9) / 5 + 32,
    label: '°F',
  },
  s: { dimension: 'time', factor: 1, label: 's' },
  min: { dimension: 'time', factor: 60, label: 'min' },
  h: { dimension: 'time', factor: 3600, label: 'h' },
  ohm: { dimension: 'resistance', factor: 1, label: 'Ω' },
  kohm: { dimension: 'resistance', factor: 1000, label: 'kΩ' },
  ratio: { dimension: 'ratio', factor: 1, label: ':1' },
} as const satisfies Record<string, UnitDefinition>;

export type UnitId = keyof typeof UNITS;

/** The dimension of each quantity a reading can hold. */
export const DIMENSION_OF: Record<Quantity, Dimension> = {
  pressure: 'pressure',
  compression: 'pressure',
  voltage: 'voltage',
  flow: 'flow',
  volume: 'volume',
  temperature: 'temperature',
  duration: 'time',
  resistance: 'resistance',
  afr: 'ratio',
};

/** Bad input to a conversion or a parse: the message is one line for the mechanic. */
export class UnitError extends Error {
  override name = 'UnitError';
}

/**
 * Spellings accepted for each unit, matched without regard to case (there are no mega- units to
 * confuse with milli-), spaces or a leading degree sign.
 */
const ALIASES: Record<string, UnitId> = {
  kpa: 'kPa',
  psi: 'psi',
  psig: 'psi',
  bar: 'bar',
  v: 'V',
  volt: 'V',
  volts: 'V',
  mv: 'mV',
  ml: 'mL',
  cc: 'mL',
  l: 'L',
  litre: 'L',
  liter: 'L',
  gal: 'gal',
  usgal: 'gal',
  floz: 'floz',
  usfloz: 'floz',
  oz: 'floz',
  'l/h': 'L/h',
  lph: 'L/h',
  'l/hr': 'L/h',
  'ml/min': 'mL/min',
  'gal/h': 'gal/h',
  'gal/hr': 'gal/h',
  gph: 'gal/h',
  mi: 'mi',
  mile: 'mi',
  miles: 'mi',
  km: 'km',
  f: 'F',
  degf: 'F',
  c: 'C',
  degc: 'C',
  s: 's',
  sec: 's',
  secs: 's',
  min: 'min',
  mins: 'min',
  h: 'h',
  hr: 'h',
  hrs: 'h',
  ohm: 'ohm',
  ohms: 'ohm',
  '\u03c9': 'ohm',
  kohm: 'kohm',
  'k\u03c9': 'kohm',
  ratio: 'ratio',
  ':1': 'ratio',
};

/** The unit a spelling names, or null. `°F`, `deg F`, `fl oz`, `L/h` and `lph` all work. */
export function findUnit(text: string): UnitId | null {
  // Lower case turns Ω into ω (U+03C9), which is how the table spells it.
  const key = text.trim().replace(/^°/, '').replace(/\s+/g, '').toLowerCase();
  return ALIASES[key] ?? null;
}

export function dimensionOf(unit: UnitId): Dimension {
  return UNITS[unit].dimension;
}

function toBase(value: number, unit: UnitId): number {
  const def: UnitDefinition = UNITS[unit];
  return 'factor' in def ? value * def.factor : def.toBase(value);
}

function fromBase(value: number, unit: UnitId): number {
  const def: UnitDefinition = UNITS[unit];
  return 'factor' in def ? value / def.factor : def.fromBase(value);
}

/** Converts between two units of one dimension; psi to litres is a UnitError. */
export function convert(value: number, from: UnitId, to: UnitId): number {
  if (!Number.isFinite(value)) throw new UnitError(`not a number: ${value}`);
  if (UNITS[from].dimension !== UNITS[to].dimension) {
    throw new UnitError(
      `cannot convert ${UNITS[from].dimension} (${from}) to ${UNITS[to].dimension} (${to})`,
    );
  }
  if (from === to) return value;
  return fromBase(toBase(value, from), to);
}

export const psiToKpa = (psi: number) => convert(psi, 'psi', 'kPa');
export const kpaToPsi = (kpa: number) => convert(kpa, 'kPa', 'psi');

export interface Measurement {
  value: number;
  unit: UnitId;
}

const NUMBER_THEN_UNIT = /^([+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:e[+-]?\d+)?)\s*(.*)$/i;

/**
 * Reads what the mechanic typed: `43psi`, `3 bar`, `250 mL`, `12.4V`, `-5 °C`. A bare number
 * takes `defaultUnit` when one is given. With `dimension`, a unit of another kind is refused, so
 * a pressure typed as `12V` is caught at the roadside rather than stored.
 */
export function parseMeasurement(
  text: string,
  options: { dimension?: Dimension; defaultUnit?: UnitId } = {},
): Measurement {
  const trimmed = text.trim();
  // Caught first: the number pattern would otherwise read `3,5 bar` as 3 of a unit ",5 bar".
  if (/^[+-]?\d+,\d/.test(trimmed))
    throw new UnitError(`"${trimmed}": write decimals with a point, e.g. 3.5bar`);
  const match = NUMBER_THEN_UNIT.exec(trimmed);
  if (!match) throw new UnitError(`"${trimmed}" is not a number with a unit, e.g. 43psi`);
  const value = Number(match[1]);
  if (!Number.isFinite(value)) throw new UnitError(`"${trimmed}" is out of range`);
  const unitText = match[2] ?? '';
  let unit: UnitId | null;
  if (unitText === '') {
    if (!options.defaultUnit) throw new UnitError(`"${trimmed}" needs a unit, e.g. ${trimmed}psi`);
    unit = options.defaultUnit;
  } else {
    unit = findUnit(unitText);
    if (!unit) throw new UnitError(`unknown unit "${unitText}" in "${trimmed}"`);
  }
  if (options.dimension && UNITS[unit].dimension !== options.dimension) {
    throw new UnitError(`"${trimmed}" is ${UNITS[unit].dimension}, expected ${options.dimension}`);
  }
  return { value, unit };
}

/** The canonical unit a quantity is stored in (kPa, V, L/h, mL, °C, s, Ω, ratio). */
export function canonicalUnit(quantity: Quantity): UnitId {
  return CANONICAL_UNITS[quantity];
}

/**
 * A typed reading for a quantity, converted to the stored unit. The entered value and unit are
 * returned too, since readings keep them to show the mechanic's own unit back.
 */
export function readingToCanonical(
  quantity: Quantity,
  text: string,
  defaultUnit?: UnitId,
): { value: number; unit: UnitId; enteredValue: number; enteredUnit: UnitId } {
  const entered = parseMeasurement(text, { dimension: DIMENSION_OF[quantity], defaultUnit });
  const unit = canonicalUnit(quantity);
  return {
    value: convert(entered.value, entered.unit, unit),
    unit,
    enteredValue: entered.value,
    enteredUnit: entered.unit,
  };
}

/** Formats a value with its unit's short label: `43 psi`, `21.1 °C`. */
export function formatMeasurement(value: number, unit: UnitId, places = 1): string {
  const factor = 10 ** places;
  const shown = Math.round(value * factor) / factor;
  const label = UNITS[unit].label;
  return label.startsWith(':') ? `${shown}${label}` : `${shown} ${label}`;
}
