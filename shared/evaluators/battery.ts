/**
 * Battery checks that come before any electrical or fuel test: resting charge, voltage held while
 * cranking, and charging voltage at raised rpm (REFERENCES.md, "Battery").
 *
 * Every function throws a RangeError for a reading that is not a finite number (NaN, Infinity);
 * any finite reading, however bad, is a verdict.
 */
import type { Evaluation, SpecSource, Verdict } from './types';
import { clean, round } from './types';

export const BATTERY_TYPES = ['flooded', 'agm', 'lithium'] as const;
export type BatteryType = (typeof BATTERY_TYPES)[number];

interface ChargePoint {
  volts: number;
  pct: number;
}

/**
 * Open-circuit voltage of a flooded 12 V battery at rest, 80 °F, against state of charge — the
 * table attributed to the Battery Council International (REFERENCES.md, "Battery").
 * Ascending by volts, as the interpolation expects.
 */
const FLOODED_REST_TABLE: readonly ChargePoint[] = [
  { volts: 11.89, pct: 0 },
  { volts: 12.06, pct: 25 },
  { volts: 12.24, pct: 50 },
  { volts: 12.45, pct: 75 },
  { volts: 12.65, pct: 100 },
];

/**
 * AGM reads higher than flooded (full about 12.8–13.0 V, REFERENCES.md, "Battery"); the rows in
 * between are common practice, no published source.
 */
const AGM_REST_TABLE: readonly ChargePoint[] = [
  { volts: 11.8, pct: 0 },
  { volts: 12.0, pct: 25 },
  { volts: 12.35, pct: 50 },
  { volts: 12.65, pct: 75 },
  { volts: 12.85, pct: 100 },
];

/** Lead-acid resting charge: enough to test on, marginal, too low (decided with the lead). */
const REST_PASS_PCT = 75;
const REST_WARN_PCT = 50;

/**
 * A LiFePO4 "12.8 V" pack sits near 13.2–13.4 V charged and falls below 12.8 V only when well
 * discharged; between the two the curve is too flat to read — common practice, no published source.
 */
const LITHIUM_CHARGED_VOLTS = 13.2;
const LITHIUM_DISCHARGED_VOLTS = 12.8;

/** Load-test floor at 70 °F (REFERENCES.md, "Battery": common practice in the trade). */
const CRANKING_MIN_VOLTS = 9.6;
/** Within 0.4 V of the floor is too close to call a battery good — common practice, no published source. */
const CRANKING_PASS_VOLTS = 10.0;

/** The usual band at raised rpm (REFERENCES.md, "Battery": common practice; the machine's spec governs). */
const GENERIC_CHARGING_MIN_VOLTS = 13.5;
const GENERIC_CHARGING_MAX_VOLTS = 14.5;
/**
 * How far outside the band a reading is a fault rather than a doubt. With the generic band the
 * overcharge line lands on 15.0 V, the most any machine commonly specifies (REFERENCES.md).
 */
const CHARGING_FAULT_MARGIN_VOLTS = 0.5;

const GENERIC_SUFFIX = ' (generic limit: confirm in the service manual)';
const REST_NOTE = 'valid only after 1–2 h at rest or with the surface charge removed';
const RETEST = 'charge and re-test before further electrical or fuel tests';

function requireFiniteVolts(name: string, volts: number): void {
  if (!Number.isFinite(volts)) throw new RangeError(`${name} must be a finite number of volts, got ${volts}`);
}

/** Linear interpolation between the rows, clamped to 0–100 % outside the table. */
function interpolateChargePct(table: readonly ChargePoint[], volts: number): number {
  const first = table[0]!;
  if (volts <= first.volts) return first.pct;
  for (let i = 1; i < table.length; i += 1) {
    const low = table[i - 1]!;
    const high = table[i]!;
    if (volts <= high.volts) {
      return clean(low.pct + ((high.pct - low.pct) * (volts - low.volts)) / (high.volts - low.volts));
    }
  }
  return table[table.length - 1]!.pct;
}

function leadAcidRestVerdict(pct: number): Verdict {
  if (pct >= REST_PASS_PCT) return 'pass';
  if (pct >= REST_WARN_PCT) return 'warn';
  return 'fail';
}

function lithiumRestVerdict(volts: number): Verdict {
  if (volts >= LITHIUM_CHARGED_VOLTS) return 'pass';
  if (volts >= LITHIUM_DISCHARGED_VOLTS) return 'warn';
  return 'fail';
}

function lithiumRestReason(volts: number, verdict: Verdict): string {
  const head = `${volts} V at rest (lithium)`;
  if (verdict === 'pass') {
    return `${head}: charged; no percentage is given because a lithium pack's voltage barely moves with charge.`;
  }
  if (verdict === 'warn') {
    return `${head}: voltage cannot tell the charge in this band; use the pack's indicator or charge and re-test.`;
  }
  return `${head}: well discharged — ${RETEST}; a lithium pack's flat curve gives no percentage.`;
}

/**
 * State of charge from the resting voltage. The verdict follows the percentage as shown (rounded
 * to 0.1 %), so the figure and the verdict never disagree at a boundary.
 */
export function evaluateBatteryRest(input: {
  volts: number;
  type: BatteryType;
}): Evaluation<{ volts: number; type: BatteryType; stateOfChargePct: number | null }> {
  const { volts, type } = input;
  requireFiniteVolts('volts', volts);
  if (!BATTERY_TYPES.includes(type)) throw new RangeError(`unknown battery type: ${String(type)}`);

  if (type === 'lithium') {
    const verdict = lithiumRestVerdict(volts);
    return {
      verdict,
      reason: lithiumRestReason(volts, verdict),
      figures: { volts, type, stateOfChargePct: null },
    };
  }

  const table = type === 'flooded' ? FLOODED_REST_TABLE : AGM_REST_TABLE;
  const stateOfChargePct = round(interpolateChargePct(table, volts), 1);
  const verdict = leadAcidRestVerdict(stateOfChargePct);
  const label = type === 'flooded' ? 'flooded' : 'AGM';
  const advice = verdict === 'pass' ? 'enough to test on' : RETEST;
  return {
    verdict,
    reason: `${volts} V at rest (${label}): about ${stateOfChargePct} % charged — ${advice} (${REST_NOTE}).`,
    figures: { volts, type, stateOfChargePct },
  };
}

/** Lowest voltage held while cranking, against the load-test floor. */
export function evaluateCrankingVoltage(input: {
  volts: number;
}): Evaluation<{ volts: number; minVolts: number }> {
  const { volts } = input;
  requireFiniteVolts('volts', volts);
  const minVolts = CRANKING_MIN_VOLTS;
  const figures = { volts, minVolts };
  const head = `${volts} V while cranking`;

  if (volts >= CRANKING_PASS_VOLTS) {
    return {
      verdict: 'pass',
      reason: `${head}, above the ${minVolts} V floor: battery, cables, grounds and starter draw are fine${GENERIC_SUFFIX}.`,
      figures,
    };
  }
  if (volts >= minVolts) {
    return {
      verdict: 'warn',
      reason: `${head}, just above the ${minVolts} V floor: load-test the battery and check the cables, grounds and starter draw${GENERIC_SUFFIX}.`,
      figures,
    };
  }
  return {
    verdict: 'fail',
    reason: `${head}, below the ${minVolts} V floor: a weak battery, poor cables or grounds, or a starter drawing too much${GENERIC_SUFFIX}.`,
    figures,
  };
}

function chargingReason(volts: number, minVolts: number, maxVolts: number, verdict: Verdict): string {
  const head = `${volts} V at raised rpm`;
  const band = `the ${minVolts}–${maxVolts} V band`;
  if (verdict === 'pass') return `${head}, inside ${band}: charging normally`;
  if (volts < minVolts) {
    return verdict === 'fail'
      ? `${head}, well under ${band}: not charging — check the stator, regulator/rectifier and their wiring`
      : `${head}, just under ${band}: charging weakly — check connections, the regulator/rectifier and the stator`;
  }
  return verdict === 'fail'
    ? `${head}, well over ${band}: overcharging — suspect the regulator/rectifier`
    : `${head}, just over ${band}: regulator/rectifier running high — re-test and watch it`;
}

/**
 * Charging voltage at raised rpm. Without limits the generic band applies; limits passed in are
 * taken as the manual's unless `specSource` says otherwise. Throws a RangeError when the band is
 * not finite or its minimum is above its maximum.
 */
export function evaluateChargingVoltage(input: {
  volts: number;
  minVolts?: number;
  maxVolts?: number;
  specSource?: SpecSource;
}): Evaluation<{ volts: number; minVolts: number; maxVolts: number; specSource: SpecSource }> {
  const { volts } = input;
  const minVolts = input.minVolts ?? GENERIC_CHARGING_MIN_VOLTS;
  const maxVolts = input.maxVolts ?? GENERIC_CHARGING_MAX_VOLTS;
  const specSource =
    input.specSource ?? (input.minVolts === undefined && input.maxVolts === undefined ? 'generic' : 'manual');
  requireFiniteVolts('volts', volts);
  requireFiniteVolts('minVolts', minVolts);
  requireFiniteVolts('maxVolts', maxVolts);
  if (minVolts > maxVolts) throw new RangeError(`minVolts ${minVolts} is above maxVolts ${maxVolts}`);

  const notChargingBelow = clean(minVolts - CHARGING_FAULT_MARGIN_VOLTS);
  const overchargingAbove = clean(maxVolts + CHARGING_FAULT_MARGIN_VOLTS);
  let verdict: Verdict = 'pass';
  if (volts < notChargingBelow || volts > overchargingAbove) verdict = 'fail';
  else if (volts < minVolts || volts > maxVolts) verdict = 'warn';

  const suffix = specSource === 'generic' ? GENERIC_SUFFIX : '';
  return {
    verdict,
    reason: `${chargingReason(volts, minVolts, maxVolts, verdict)}${suffix}.`,
    figures: { volts, minVolts, maxVolts, specSource },
  };
}
