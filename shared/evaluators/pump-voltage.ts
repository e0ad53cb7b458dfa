/**
 * Voltage across the fuel pump's power and ground at its connector, back-probed during the prime
 * window, read against battery voltage (PRODUCT.md, "Fuel delivery check": no prime run).
 *
 * Throws a RangeError for a reading that is not a finite number; any real reading is a verdict.
 */
import type { Evaluation, Verdict } from './types';
import { clean } from './types';

export type PumpVoltageState = 'present' | 'low' | 'absent';

/** What lies between the battery and the pump when no voltage arrives (PRODUCT.md, "Fuel delivery check"). */
export const UPSTREAM_PARTS: readonly string[] = [
  'fuse',
  'pump/main relay',
  'run/stop switch',
  'tip-over (bank-angle) sensor',
  'ECU output',
  'wiring and connectors',
];

/** Where voltage is lost when some, but too little, reaches the pump (PRODUCT.md, "Fuel delivery check"). */
export const VOLTAGE_DROP_PARTS: readonly string[] = ['wiring', 'connectors', 'grounds'];

/** Under 1 V is no supply at all, only meter noise or leakage — common practice, no published source. */
const ABSENT_BELOW_VOLTS = 1.0;
/**
 * Within 1 V of the battery the supply is sound; further below is a drop in the path — common
 * practice, no published source.
 */
const PRESENT_WITHIN_VOLTS = 1.0;

function requireFiniteVolts(name: string, volts: number): void {
  if (!Number.isFinite(volts)) throw new RangeError(`${name} must be a finite number of volts, got ${volts}`);
}

function pumpVoltageState(volts: number, belowBatteryVolts: number): PumpVoltageState {
  if (volts < ABSENT_BELOW_VOLTS) return 'absent';
  if (belowBatteryVolts <= PRESENT_WITHIN_VOLTS) return 'present';
  return 'low';
}

/**
 * A pass means only that the supply reaches the pump; whether a pump that got voltage and did not
 * run is faulty is the caller's decision.
 */
export function evaluatePumpConnectorVoltage(input: { volts: number; batteryVolts: number }): Evaluation<{
  volts: number;
  batteryVolts: number;
  belowBatteryVolts: number;
  state: PumpVoltageState;
  checkUpstream: readonly string[];
}> {
  const { volts, batteryVolts } = input;
  requireFiniteVolts('volts', volts);
  requireFiniteVolts('batteryVolts', batteryVolts);
  const belowBatteryVolts = clean(batteryVolts - volts);
  const state = pumpVoltageState(volts, belowBatteryVolts);
  const readings = `${volts} V at the pump during prime, battery ${batteryVolts} V`;

  let verdict: Verdict;
  let reason: string;
  let checkUpstream: readonly string[];
  if (state === 'absent') {
    verdict = 'fail';
    checkUpstream = [...UPSTREAM_PARTS];
    reason = `No voltage at the pump during prime (${volts} V, battery ${batteryVolts} V): open circuit or a control part upstream — check ${UPSTREAM_PARTS.join(', ')}.`;
  } else if (state === 'present') {
    verdict = 'pass';
    checkUpstream = [];
    reason = `${readings} (${belowBatteryVolts} V under): supply reaches the pump.`;
  } else {
    verdict = 'fail';
    checkUpstream = [...VOLTAGE_DROP_PARTS];
    reason = `${readings} (${belowBatteryVolts} V under): voltage drop in the wiring, a connector or the ground — check ${VOLTAGE_DROP_PARTS.join(', ')}.`;
  }
  return { verdict, reason, figures: { volts, batteryVolts, belowBatteryVolts, state, checkUpstream } };
}
