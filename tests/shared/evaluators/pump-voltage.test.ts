import { describe, expect, it } from 'vitest';
import {
  UPSTREAM_PARTS,
  VOLTAGE_DROP_PARTS,
  evaluatePumpConnectorVoltage,
} from '../../../shared/evaluators/pump-voltage';

describe('evaluatePumpConnectorVoltage', () => {
  it('lists the parts upstream of the pump in plain words', () => {
    // PRODUCT.md, "Fuel delivery check": fuse, pump/main relay, run/stop switch, tip-over
    // (bank-angle) sensor, ECU output, wiring.
    expect(UPSTREAM_PARTS).toEqual([
      'fuse',
      'pump/main relay',
      'run/stop switch',
      'tip-over (bank-angle) sensor',
      'ECU output',
      'wiring and connectors',
    ]);
  });

  // Under 1.0 V is absent; within 1.0 V of the battery is present; otherwise low — common
  // practice, no published source. Battery 12.6 V throughout; belowBatteryVolts worked by hand.
  it.each([
    { volts: 0, below: 12.6, state: 'absent', verdict: 'fail' },
    { volts: 0.99, below: 11.61, state: 'absent', verdict: 'fail' }, // just under 1.0 V
    { volts: 1.0, below: 11.6, state: 'low', verdict: 'fail' }, // 1.0 V is some voltage, far too little
    { volts: 9.8, below: 2.8, state: 'low', verdict: 'fail' },
    { volts: 11.59, below: 1.01, state: 'low', verdict: 'fail' }, // 12.6 − 11.59 = 1.01, just over
    { volts: 11.6, below: 1, state: 'present', verdict: 'pass' }, // 12.6 − 11.6 = 1.0, on the line
    { volts: 12.3, below: 0.3, state: 'present', verdict: 'pass' },
    { volts: 12.6, below: 0, state: 'present', verdict: 'pass' },
    { volts: 12.7, below: -0.1, state: 'present', verdict: 'pass' }, // meter tolerance above battery
  ] as const)('$volts V at the pump is $state ($verdict)', ({ volts, below, state, verdict }) => {
    const result = evaluatePumpConnectorVoltage({ volts, batteryVolts: 12.6 });
    expect(result.verdict).toBe(verdict);
    expect(result.figures.state).toBe(state);
    expect(result.figures.belowBatteryVolts).toBe(below);
    expect(result.figures.volts).toBe(volts);
    expect(result.figures.batteryVolts).toBe(12.6);
  });

  it('points upstream when no voltage arrives', () => {
    // PRODUCT.md, "Fuel delivery check": no voltage → open circuit or a control part upstream.
    const result = evaluatePumpConnectorVoltage({ volts: 0.2, batteryVolts: 12.5 });
    expect(result.figures.checkUpstream).toEqual(UPSTREAM_PARTS);
    expect(result.reason).toBe(
      'No voltage at the pump during prime (0.2 V, battery 12.5 V): open circuit or a control part upstream — check fuse, pump/main relay, run/stop switch, tip-over (bank-angle) sensor, ECU output, wiring and connectors.',
    );
  });

  it('points at wiring, connectors and grounds when the voltage is low', () => {
    // PRODUCT.md, "Fuel delivery check": low voltage → voltage drop in wiring, connector or ground.
    const result = evaluatePumpConnectorVoltage({ volts: 9.8, batteryVolts: 12.6 });
    expect(result.figures.checkUpstream).toEqual(['wiring', 'connectors', 'grounds']);
    expect(result.figures.checkUpstream).toEqual(VOLTAGE_DROP_PARTS);
    expect(result.reason).toContain('2.8 V under');
    expect(result.reason).toContain('voltage drop in the wiring, a connector or the ground');
  });

  it('says only that the supply reaches the pump when it does', () => {
    const result = evaluatePumpConnectorVoltage({ volts: 12.3, batteryVolts: 12.6 });
    expect(result.figures.checkUpstream).toEqual([]);
    expect(result.reason).toBe(
      '12.3 V at the pump during prime, battery 12.6 V (0.3 V under): supply reaches the pump.',
    );
  });

  it('judges against the battery it is given, not a fixed 12 V', () => {
    // A weak 11.2 V battery and 10.4 V at the pump: 0.8 V under, so the wiring is sound.
    expect(evaluatePumpConnectorVoltage({ volts: 10.4, batteryVolts: 11.2 }).figures.state).toBe('present');
    // The same 10.4 V behind a 12.8 V battery is 2.4 V lost on the way.
    expect(evaluatePumpConnectorVoltage({ volts: 10.4, batteryVolts: 12.8 }).figures.state).toBe('low');
  });

  it('refuses readings that are not numbers', () => {
    expect(() => evaluatePumpConnectorVoltage({ volts: Number.NaN, batteryVolts: 12.6 })).toThrow(RangeError);
    expect(() => evaluatePumpConnectorVoltage({ volts: 12, batteryVolts: Number.POSITIVE_INFINITY })).toThrow(
      RangeError,
    );
  });
});
