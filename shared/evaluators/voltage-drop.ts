/**
 * Voltage drop along a power or ground path under load: the supply end against the load end
 * (REFERENCES.md, "Circuit voltage drop").
 *
 * Throws a RangeError for a reading that is not a finite number, or a limit that is not a
 * positive finite number; any real reading is a verdict.
 */
import type { Evaluation } from './types';
import { clean } from './types';

/** A whole feed should lose no more than about 0.5 V — common practice, no single published standard. */
export const DEFAULT_MAX_DROP_VOLTS = 0.5;
/** The per-cable or per-connection figure from the same guidance, offered when a feed fails. */
const PER_SECTION_DROP_VOLTS = 0.2;

const GENERIC_SUFFIX = ' (generic limit: confirm in the service manual)';

function requireFiniteVolts(name: string, volts: number): void {
  if (!Number.isFinite(volts)) throw new RangeError(`${name} must be a finite number of volts, got ${volts}`);
}

/**
 * Pass up to the limit, fail beyond it: there is no doubtful band, the limit is the limit. A
 * load end that reads above the supply cannot happen on a loaded feed, so it is a warn that asks
 * for the readings again.
 */
export function evaluateVoltageDrop(input: {
  supplyVolts: number;
  loadVolts: number;
  maxDropVolts?: number;
}): Evaluation<{ supplyVolts: number; loadVolts: number; dropVolts: number; maxDropVolts: number }> {
  const { supplyVolts, loadVolts } = input;
  const maxDropVolts = input.maxDropVolts ?? DEFAULT_MAX_DROP_VOLTS;
  requireFiniteVolts('supplyVolts', supplyVolts);
  requireFiniteVolts('loadVolts', loadVolts);
  requireFiniteVolts('maxDropVolts', maxDropVolts);
  if (maxDropVolts <= 0) throw new RangeError(`maxDropVolts must be above 0 V, got ${maxDropVolts}`);

  const dropVolts = clean(supplyVolts - loadVolts);
  const figures = { supplyVolts, loadVolts, dropVolts, maxDropVolts };
  const readings = `${supplyVolts} V at the supply, ${loadVolts} V at the load`;
  const suffix = input.maxDropVolts === undefined ? GENERIC_SUFFIX : '';

  if (dropVolts < 0) {
    return {
      verdict: 'warn',
      reason: `${readings}: the load reads ${clean(-dropVolts)} V above the supply — meter leads or readings are likely swapped; measure again.`,
      figures,
    };
  }
  if (dropVolts <= maxDropVolts) {
    return {
      verdict: 'pass',
      reason: `${readings}: ${dropVolts} V lost, within the ${maxDropVolts} V limit${suffix}.`,
      figures,
    };
  }
  return {
    verdict: 'fail',
    reason: `${readings}: ${dropVolts} V lost, over the ${maxDropVolts} V limit — find the cable or connection losing more than about ${PER_SECTION_DROP_VOLTS} V and clean or repair it${suffix}.`,
    figures,
  };
}
