import { describe, expect, it } from 'vitest';
import { DEFAULT_MAX_DROP_VOLTS, evaluateVoltageDrop } from '../../../shared/evaluators/voltage-drop';

describe('evaluateVoltageDrop', () => {
  it('defaults to 0.5 V for a whole feed', () => {
    // REFERENCES.md, "Circuit voltage drop": about 0.5 V for a whole feed — common practice.
    expect(DEFAULT_MAX_DROP_VOLTS).toBe(0.5);
  });

  // Whole-feed limit 0.5 V (REFERENCES.md, "Circuit voltage drop"); pass up to it, fail past it,
  // no warn band (decided with the lead). Drops worked by hand: supply − load.
  it.each([
    { supplyVolts: 12.6, loadVolts: 12.6, dropVolts: 0, verdict: 'pass' },
    { supplyVolts: 12.6, loadVolts: 12.2, dropVolts: 0.4, verdict: 'pass' }, // 12.6 − 12.2 = 0.4
    { supplyVolts: 12.6, loadVolts: 12.1, dropVolts: 0.5, verdict: 'pass' }, // exactly the limit
    { supplyVolts: 12.6, loadVolts: 12.09, dropVolts: 0.51, verdict: 'fail' }, // 0.01 V over
    { supplyVolts: 12.4, loadVolts: 10.9, dropVolts: 1.5, verdict: 'fail' },
  ] as const)(
    '$supplyVolts V to $loadVolts V drops $dropVolts V: $verdict',
    ({ supplyVolts, loadVolts, dropVolts, verdict }) => {
      const result = evaluateVoltageDrop({ supplyVolts, loadVolts });
      expect(result.verdict).toBe(verdict);
      expect(result.figures).toEqual({ supplyVolts, loadVolts, dropVolts, maxDropVolts: 0.5 });
      expect(result.reason.endsWith('(generic limit: confirm in the service manual).')).toBe(true);
    },
  );

  // A per-cable limit of 0.2 V (REFERENCES.md, "Circuit voltage drop": about 0.2 V per cable or
  // section — common practice).
  it.each([
    { supplyVolts: 11.55, loadVolts: 11.35, verdict: 'pass' }, // 11.55 − 11.35 is 0.20000000000000107 in floats: 0.2 V, on the limit
    { supplyVolts: 12.6, loadVolts: 12.4, verdict: 'pass' }, // 0.2 V
    { supplyVolts: 12.6, loadVolts: 12.39, verdict: 'fail' }, // 0.21 V
  ] as const)(
    '$supplyVolts V to $loadVolts V against 0.2 V: $verdict',
    ({ supplyVolts, loadVolts, verdict }) => {
      const result = evaluateVoltageDrop({ supplyVolts, loadVolts, maxDropVolts: 0.2 });
      expect(result.verdict).toBe(verdict);
      expect(result.reason).not.toContain('generic limit');
    },
  );

  it('names the per-cable guidance when a feed fails', () => {
    expect(evaluateVoltageDrop({ supplyVolts: 12.6, loadVolts: 11.8 }).reason).toBe(
      '12.6 V at the supply, 11.8 V at the load: 0.8 V lost, over the 0.5 V limit — find the cable or connection losing more than about 0.2 V and clean or repair it (generic limit: confirm in the service manual).',
    );
  });

  it('warns that the leads or readings are swapped when the load reads above the supply', () => {
    // A loaded feed cannot gain voltage: the readings are at fault, not the circuit.
    const result = evaluateVoltageDrop({ supplyVolts: 12.4, loadVolts: 12.6 });
    expect(result.verdict).toBe('warn');
    expect(result.figures.dropVolts).toBe(-0.2); // 12.4 − 12.6
    expect(result.reason).toContain('swapped');
    expect(result.reason).toContain('0.2 V above the supply');
  });

  it('refuses readings and limits that are not numbers, and a limit of zero or less', () => {
    expect(() => evaluateVoltageDrop({ supplyVolts: Number.NaN, loadVolts: 12 })).toThrow(RangeError);
    expect(() => evaluateVoltageDrop({ supplyVolts: 12, loadVolts: Number.POSITIVE_INFINITY })).toThrow(
      RangeError,
    );
    expect(() => evaluateVoltageDrop({ supplyVolts: 12, loadVolts: 11, maxDropVolts: Number.NaN })).toThrow(
      RangeError,
    );
    expect(() => evaluateVoltageDrop({ supplyVolts: 12, loadVolts: 11, maxDropVolts: 0 })).toThrow(
      RangeError,
    );
  });
});
