import { describe, expect, it } from 'vitest';
import { diagnoseLeanRunning, LEAN_CAUSES } from '../../../shared/evaluators/lean-running';

const dipped = { verdict: 'fail' as const, figures: { dipPhases: ['snap', 'held'], highPhases: [] } };
const inBand = { verdict: 'pass' as const, figures: { dipPhases: [], highPhases: [] } };
const ranking = (input: Parameters<typeof diagnoseLeanRunning>[0]) =>
  diagnoseLeanRunning(input).causes.map((c) => c.cause);

describe('lean running: ranked probable causes with their evidence', () => {
  it('with only a measured dip, keeps the trade order: filter, pump, voltage, pick-up, regulator', () => {
    // PRODUCT.md, "Lean running": causes "most likely first" in this order (common practice).
    expect(ranking({ symptoms: ['cuts_out_under_load'], runningPressure: dipped })).toEqual([
      'restricted_filter',
      'worn_pump',
      'low_supply_voltage',
      'restricted_pickup',
      'faulty_regulator',
    ]);
  });

  it('puts low supply voltage first when the pump sees well under battery voltage', () => {
    const order = ranking({
      symptoms: ['cuts_out_under_load'],
      runningPressure: dipped,
      pumpVoltage: { verdict: 'fail', figures: { state: 'low' } },
      filters: 'ok',
    });
    expect(order[0]).toBe('low_supply_voltage');
  });

  it('puts the regulator first when flow at the pump is good but pressure dips', () => {
    const order = ranking({
      symptoms: [],
      runningPressure: dipped,
      flow: { verdict: 'pass', figures: {} },
      filters: 'ok',
      supplyDrop: { verdict: 'pass', figures: {} },
    });
    expect(order[0]).toBe('faulty_regulator');
  });

  it('names the evidence for each cause, and what speaks against it', () => {
    const diagnosis = diagnoseLeanRunning({
      symptoms: ['revs_then_cuts_out'],
      runningPressure: dipped,
      filters: 'ok',
    });
    const filter = diagnosis.causes.find((c) => c.cause === 'restricted_filter')!;
    expect(filter.evidence).toContain('Running pressure dipped below spec (snap, held)');
    expect(filter.evidence.some((e) => e.startsWith('Against: filters recently replaced'))).toBe(true);
    expect(filter.nextAction).toBe(LEAN_CAUSES.restricted_filter.nextAction);
  });

  it('says there is no sign of starvation when pressure held and stayed in band', () => {
    const diagnosis = diagnoseLeanRunning({
      symptoms: [],
      runningPressure: inBand,
      hold: { verdict: 'pass', figures: { peakKpa: 300, reachedSpec: true } },
      filters: 'ok',
    });
    expect(diagnosis.causes).toEqual([]);
    expect(diagnosis.verdict).toBe('pass');
    expect(diagnosis.reason).toMatch(/ignition/);
  });

  it('ties long cranking and a falling hold to the check valve, not to starvation', () => {
    const diagnosis = diagnoseLeanRunning({
      symptoms: ['long_cranking'],
      hold: { verdict: 'fail', figures: { peakKpa: 300, reachedSpec: true } },
      runningPressure: inBand,
    });
    expect(diagnosis.causes[0]!.cause).toBe('leaking_check_valve');
    expect(diagnosis.starvationMeasured).toBe(false);
  });
});
