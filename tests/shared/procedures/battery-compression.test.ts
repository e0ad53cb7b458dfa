import { describe, expect, it } from 'vitest';
import { answerStep, startRun, type RunView } from '../../../shared/procedures/engine';
import { walkWith } from '../../helpers/procedures';
import { PROCEDURES } from '../../../shared/procedures/index';

const walk = walkWith;

const V = (value: number) => ({ value, unit: 'V' });
const keys = (view: RunView) => view.outcome!.findings.map((f) => f.key);
const battery = PROCEDURES['battery-charging'];
const compression = PROCEDURES.compression;

describe('battery and charging check', () => {
  it('passes a charged battery that cranks and charges in band', () => {
    // 12.65 V = 100 % (BCI table); ≥ 10 V cranking (9.6 V load-test floor, common practice);
    // 14.2 V inside 13.5–14.5 V (REFERENCES.md, "Battery": common practice).
    const view = walk(battery, {
      'battery-rest': { batteryType: 'flooded', volts: V(12.65) },
      'cranking-voltage': { volts: V(10.4) },
      'charging-voltage': { volts: V(14.2) },
    });
    expect(view.outcome!.verdict).toBe('pass');
    expect(keys(view)).toEqual([]);
  });

  it('stops at a discharged battery', () => {
    // 11.95 V is between 11.89 V (0 %) and 12.06 V (25 %) on the BCI table.
    const view = walk(battery, { 'battery-rest': { batteryType: 'flooded', volts: V(11.95) } });
    expect(keys(view)).toEqual(['battery-discharged']);
  });

  it('follows weak cranking into the starting circuit, and finds the lost volts', () => {
    // 9.2 V while cranking is under the 9.6 V floor; 10.9 − 9.9 = 1.0 V lost, over 0.5 V.
    const view = walk(battery, {
      'battery-rest': { batteryType: 'agm', volts: V(12.9) },
      'cranking-voltage': { volts: V(9.2) },
      'starter-circuit-drop': { supplyVolts: V(10.9), loadVolts: V(9.9) },
      'charging-voltage': { volts: V(14.0) },
    });
    expect(view.steps.map((s) => s.stepKey)).toContain('starter-circuit-drop');
    expect(keys(view)).toEqual(['weak-cranking', 'starter-cable-drop']);
  });

  it('flags a charging voltage well above the band as a regulator fault', () => {
    const view = walk(battery, {
      'battery-rest': { batteryType: 'flooded', volts: V(12.6) },
      'cranking-voltage': { volts: V(10.5) },
      'charging-voltage': { volts: V(15.8) },
    });
    expect(keys(view)).toEqual(['charging-fault']);
    expect(view.outcome!.verdict).toBe('fail');
  });
});

describe('compression check', () => {
  const psi = (...values: number[]) => ({ cylinders: { unit: 'psi', values } });

  it('ends after the dry test when the cylinders are even', () => {
    // 165/160: spread 3 %, within 10 % (REFERENCES.md, "Compression": common practice).
    const view = walk(compression, { 'compression-dry': psi(165, 160) });
    expect(view.steps).toHaveLength(1);
    expect(view.outcome!.verdict).toBe('pass');
  });

  it('a low cylinder that rises with oil: rings', () => {
    // 120 vs 165: spread 27 %, a fault; wet 150 is +25 % on the low one.
    const view = walk(compression, { 'compression-dry': psi(165, 120), 'compression-wet': psi(170, 150) });
    expect(keys(view)).toEqual(['compression-low', 'worn-rings']);
  });

  it('a low cylinder that stays low with oil: valves or head gasket', () => {
    const view = walk(compression, { 'compression-dry': psi(165, 120), 'compression-wet': psi(168, 123) });
    expect(keys(view)).toEqual(['compression-low', 'valves-or-gasket']);
  });

  it('asks for as many wet readings as dry ones', () => {
    let state = startRun(compression);
    const dry = answerStep(compression, state, {
      stepKey: 'compression-dry',
      answer: psi(165, 120),
      cautionAcknowledged: true,
    });
    if (!dry.ok) throw new Error(dry.error);
    state = dry.state;
    const wet = answerStep(compression, state, {
      stepKey: 'compression-wet',
      answer: psi(170),
      cautionAcknowledged: true,
    });
    expect(wet).toEqual({ ok: false, error: expect.stringMatching(/give 2 values/) });
  });
});
