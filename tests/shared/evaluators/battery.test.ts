import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  evaluateBatteryRest,
  evaluateChargingVoltage,
  evaluateCrankingVoltage,
} from '../../../shared/evaluators/battery';

const GENERIC_SUFFIX = '(generic limit: confirm in the service manual).';

describe('evaluateBatteryRest, flooded', () => {
  // Every row of the open-circuit table attributed to the Battery Council International, flooded,
  // at rest, 80 °F (REFERENCES.md, "Battery"), reproduced exactly.
  it.each([
    { volts: 12.65, pct: 100 }, // BCI table row
    { volts: 12.45, pct: 75 }, // BCI table row
    { volts: 12.24, pct: 50 }, // BCI table row
    { volts: 12.06, pct: 25 }, // BCI table row
    { volts: 11.89, pct: 0 }, // BCI table row
  ])('reads $volts V as $pct % (BCI table row)', ({ volts, pct }) => {
    expect(evaluateBatteryRest({ volts, type: 'flooded' }).figures.stateOfChargePct).toBe(pct);
  });

  // Linear interpolation between BCI rows (REFERENCES.md: "interpolate between rows"), worked by hand.
  it.each([
    { volts: 12.55, pct: 87.5 }, // 75 + 25 × (12.55 − 12.45) / (12.65 − 12.45) = 75 + 25 × 0.5 = 87.5
    { volts: 12.38, pct: 66.7 }, // 50 + 25 × 0.14 / 0.21 = 66.667 → 66.7
    { volts: 12.35, pct: 63.1 }, // 50 + 25 × 0.11 / 0.21 = 63.095 → 63.1
    { volts: 12.15, pct: 37.5 }, // 25 + 25 × 0.09 / 0.18 = 37.5
    { volts: 11.95, pct: 8.8 }, // 0 + 25 × 0.06 / 0.17 = 8.824 → 8.8
  ])('interpolates $volts V to $pct %', ({ volts, pct }) => {
    expect(evaluateBatteryRest({ volts, type: 'flooded' }).figures.stateOfChargePct).toBe(pct);
  });

  // Outside the BCI table the charge is clamped to 0–100 % (decided with the lead).
  it.each([
    { volts: 13.1, pct: 100 }, // above the 12.65 V full row
    { volts: 11.2, pct: 0 }, // below the 11.89 V empty row
    { volts: 0, pct: 0 },
  ])('clamps $volts V to $pct %', ({ volts, pct }) => {
    expect(evaluateBatteryRest({ volts, type: 'flooded' }).figures.stateOfChargePct).toBe(pct);
  });

  // Verdict bands: pass at ≥ 75 %, warn at ≥ 50 %, fail below (decided with the lead; charge
  // from the BCI table, REFERENCES.md "Battery").
  it.each([
    { volts: 12.65, verdict: 'pass' }, // 100 %
    { volts: 12.45, verdict: 'pass' }, // exactly 75 %, the pass boundary
    { volts: 12.4497, verdict: 'pass' }, // 50 + 25 × 0.2097 / 0.21 = 74.964 → shown 75.0 %: verdict follows the figure
    { volts: 12.44, verdict: 'warn' }, // 50 + 25 × 0.20 / 0.21 = 73.8 %
    { volts: 12.24, verdict: 'warn' }, // exactly 50 %, the warn boundary
    { volts: 12.23, verdict: 'fail' }, // 25 + 25 × 0.17 / 0.18 = 48.6 %
    { volts: 11.5, verdict: 'fail' }, // 0 %
  ] as const)('judges $volts V as $verdict', ({ volts, verdict }) => {
    expect(evaluateBatteryRest({ volts, type: 'flooded' }).verdict).toBe(verdict);
  });

  it('asks for a charge before testing further, and says when a resting reading is valid', () => {
    // Rest 1–2 h or remove surface charge: REFERENCES.md, "Battery" (common practice).
    const low = evaluateBatteryRest({ volts: 12.38, type: 'flooded' });
    expect(low.reason).toBe(
      '12.38 V at rest (flooded): about 66.7 % charged — charge and re-test before further electrical or fuel tests (valid only after 1–2 h at rest or with the surface charge removed).',
    );
    const good = evaluateBatteryRest({ volts: 12.65, type: 'flooded' });
    expect(good.reason).not.toContain('re-test');
    expect(good.reason).toContain('1–2 h');
    expect(good.figures).toEqual({ volts: 12.65, type: 'flooded', stateOfChargePct: 100 });
  });
});

describe('evaluateBatteryRest, AGM', () => {
  // Vanbay's AGM table — common practice, no published source; full about 12.8–13.0 V per
  // REFERENCES.md, "Battery".
  it.each([
    { volts: 12.85, pct: 100 }, // AGM table row (common practice, no published source)
    { volts: 12.65, pct: 75 }, // AGM table row
    { volts: 12.35, pct: 50 }, // AGM table row
    { volts: 12.0, pct: 25 }, // AGM table row
    { volts: 11.8, pct: 0 }, // AGM table row
    { volts: 12.75, pct: 87.5 }, // 75 + 25 × 0.10 / 0.20 = 87.5
    { volts: 12.5, pct: 62.5 }, // 50 + 25 × 0.15 / 0.30 = 62.5
    { volts: 12.2, pct: 39.3 }, // 25 + 25 × 0.20 / 0.35 = 39.29 → 39.3
    { volts: 11.9, pct: 12.5 }, // 0 + 25 × 0.10 / 0.20 = 12.5
    { volts: 13.0, pct: 100 }, // clamped above the table
    { volts: 11.5, pct: 0 }, // clamped below the table
  ])('reads $volts V as $pct %', ({ volts, pct }) => {
    expect(evaluateBatteryRest({ volts, type: 'agm' }).figures.stateOfChargePct).toBe(pct);
  });

  it('reads higher than flooded, so a flooded full reading is only 75 % on AGM', () => {
    // 12.65 V: 100 % on the BCI flooded table, the 75 % row of the AGM table (common practice).
    expect(evaluateBatteryRest({ volts: 12.65, type: 'agm' }).verdict).toBe('pass');
    expect(evaluateBatteryRest({ volts: 12.64, type: 'agm' }).verdict).toBe('warn'); // 74.2 %
    expect(evaluateBatteryRest({ volts: 12.35, type: 'agm' }).verdict).toBe('warn'); // 50 %
    expect(evaluateBatteryRest({ volts: 12.34, type: 'agm' }).verdict).toBe('fail'); // 49.2 %
    expect(evaluateBatteryRest({ volts: 12.34, type: 'agm' }).reason).toContain('(AGM)');
  });
});

describe('evaluateBatteryRest, lithium', () => {
  // LiFePO4 has a flat curve: no percentage (REFERENCES.md, "Battery"). Bands 13.2 V and 12.8 V —
  // common practice, no published source.
  it.each([
    { volts: 13.4, verdict: 'pass' },
    { volts: 13.2, verdict: 'pass' }, // charged boundary
    { volts: 13.19, verdict: 'warn' },
    { volts: 12.8, verdict: 'warn' }, // lower edge of the band voltage cannot read
    { volts: 12.79, verdict: 'fail' },
    { volts: 11.0, verdict: 'fail' },
  ] as const)('judges $volts V as $verdict with no percentage', ({ volts, verdict }) => {
    const result = evaluateBatteryRest({ volts, type: 'lithium' });
    expect(result.verdict).toBe(verdict);
    expect(result.figures.stateOfChargePct).toBeNull();
  });

  it('says why it gives no percentage', () => {
    expect(evaluateBatteryRest({ volts: 13.0, type: 'lithium' }).reason).toBe(
      "13 V at rest (lithium): voltage cannot tell the charge in this band; use the pack's indicator or charge and re-test.",
    );
    expect(evaluateBatteryRest({ volts: 13.3, type: 'lithium' }).reason).toContain('no percentage');
  });

  it('never returns a percentage for any reading', () => {
    // REFERENCES.md, "Battery": say so instead of guessing.
    fc.assert(
      fc.property(fc.double({ min: 0, max: 20, noNaN: true }), (volts) => {
        return evaluateBatteryRest({ volts, type: 'lithium' }).figures.stateOfChargePct === null;
      }),
    );
  });
});

describe('evaluateBatteryRest, properties', () => {
  // A state-of-charge table rises with voltage (BCI table, REFERENCES.md; AGM table likewise),
  // so interpolation and clamping must keep it monotonic and within 0–100 %.
  it.each(['flooded', 'agm'] as const)('is monotonic non-decreasing and within 0–100 %% for %s', (type) => {
    fc.assert(
      fc.property(
        fc.double({ min: 9, max: 15, noNaN: true }),
        fc.double({ min: 9, max: 15, noNaN: true }),
        (a, b) => {
          const [low, high] = a <= b ? [a, b] : [b, a];
          const lowPct = evaluateBatteryRest({ volts: low, type }).figures.stateOfChargePct;
          const highPct = evaluateBatteryRest({ volts: high, type }).figures.stateOfChargePct;
          if (lowPct === null || highPct === null) return false;
          return lowPct <= highPct && lowPct >= 0 && highPct <= 100;
        },
      ),
    );
  });

  it('refuses readings that are not numbers', () => {
    expect(() => evaluateBatteryRest({ volts: Number.NaN, type: 'flooded' })).toThrow(RangeError);
    expect(() => evaluateBatteryRest({ volts: Number.POSITIVE_INFINITY, type: 'agm' })).toThrow(RangeError);
    expect(() => evaluateBatteryRest({ volts: Number.NaN, type: 'lithium' })).toThrow(RangeError);
  });
});

describe('evaluateCrankingVoltage', () => {
  // 9.6 V load-test floor (REFERENCES.md, "Battery": common practice in the trade); pass from
  // 10.0 V — common practice, no published source.
  it.each([
    { volts: 10.8, verdict: 'pass' },
    { volts: 10.0, verdict: 'pass' }, // pass boundary
    { volts: 9.99, verdict: 'warn' },
    { volts: 9.6, verdict: 'warn' }, // the floor itself still holds
    { volts: 9.59, verdict: 'fail' },
    { volts: 7.2, verdict: 'fail' },
  ] as const)('judges $volts V as $verdict', ({ volts, verdict }) => {
    const result = evaluateCrankingVoltage({ volts });
    expect(result.verdict).toBe(verdict);
    expect(result.figures).toEqual({ volts, minVolts: 9.6 });
  });

  it('names battery, cables and grounds, and starter draw when it fails', () => {
    const { reason } = evaluateCrankingVoltage({ volts: 8.9 });
    expect(reason).toMatch(/^8\.9 V while cranking, below the 9\.6 V floor/);
    for (const part of ['battery', 'cables', 'grounds', 'starter']) expect(reason).toContain(part);
    expect(reason.endsWith(GENERIC_SUFFIX)).toBe(true);
  });

  it('refuses readings that are not numbers', () => {
    expect(() => evaluateCrankingVoltage({ volts: Number.NaN })).toThrow(RangeError);
    expect(() => evaluateCrankingVoltage({ volts: Number.NEGATIVE_INFINITY })).toThrow(RangeError);
  });
});

describe('evaluateChargingVoltage', () => {
  // Generic band 13.5–14.5 V (REFERENCES.md, "Battery": common practice); fail past 0.5 V outside
  // it, so over 15.0 V — the most machines commonly specify (same section).
  it.each([
    { volts: 14.1, verdict: 'pass' },
    { volts: 13.5, verdict: 'pass' }, // band minimum
    { volts: 14.5, verdict: 'pass' }, // band maximum
    { volts: 13.49, verdict: 'warn' },
    { volts: 13.0, verdict: 'warn' }, // exactly 0.5 V under: not yet "below the band minus 0.5 V"
    { volts: 12.99, verdict: 'fail' }, // not charging
    { volts: 12.6, verdict: 'fail' }, // battery voltage only
    { volts: 14.51, verdict: 'warn' },
    { volts: 15.0, verdict: 'warn' },
    { volts: 15.01, verdict: 'fail' }, // overcharging
  ] as const)('judges $volts V against the generic band as $verdict', ({ volts, verdict }) => {
    const result = evaluateChargingVoltage({ volts });
    expect(result.verdict).toBe(verdict);
    expect(result.figures).toEqual({ volts, minVolts: 13.5, maxVolts: 14.5, specSource: 'generic' });
    expect(result.reason.endsWith(GENERIC_SUFFIX)).toBe(true);
  });

  // A machine specifying up to 15 V (REFERENCES.md, "Battery"): the band is 13.0–15.0 V, the
  // fault lines 12.5 V and 15.5 V. Values invented for the test, not from any manual.
  it.each([
    { volts: 14.9, verdict: 'pass' },
    { volts: 15.0, verdict: 'pass' },
    { volts: 15.5, verdict: 'warn' },
    { volts: 15.51, verdict: 'fail' },
    { volts: 12.5, verdict: 'warn' },
    { volts: 12.49, verdict: 'fail' },
  ] as const)('judges $volts V against a 13.0–15.0 V manual band as $verdict', ({ volts, verdict }) => {
    const result = evaluateChargingVoltage({ volts, minVolts: 13, maxVolts: 15, specSource: 'manual' });
    expect(result.verdict).toBe(verdict);
    expect(result.figures.specSource).toBe('manual');
    expect(result.reason).not.toContain('generic limit');
  });

  it('moves the fault lines with a manual band', () => {
    // A 13.2–14.8 V manual band (invented for the test): fault lines 12.7 V and 15.3 V (band ± 0.5 V).
    expect(evaluateChargingVoltage({ volts: 15.3, minVolts: 13.2, maxVolts: 14.8 }).verdict).toBe('warn');
    expect(evaluateChargingVoltage({ volts: 15.31, minVolts: 13.2, maxVolts: 14.8 }).verdict).toBe('fail');
    expect(evaluateChargingVoltage({ volts: 12.7, minVolts: 13.2, maxVolts: 14.8 }).verdict).toBe('warn');
    expect(evaluateChargingVoltage({ volts: 12.69, minVolts: 13.2, maxVolts: 14.8 }).verdict).toBe('fail');
  });

  it('treats limits passed without a source as the manual’s', () => {
    expect(evaluateChargingVoltage({ volts: 14, maxVolts: 14.8 }).figures).toEqual({
      volts: 14,
      minVolts: 13.5,
      maxVolts: 14.8,
      specSource: 'manual',
    });
  });

  it('says whether it is not charging or overcharging', () => {
    expect(evaluateChargingVoltage({ volts: 12.6 }).reason).toBe(
      '12.6 V at raised rpm, well under the 13.5–14.5 V band: not charging — check the stator, regulator/rectifier and their wiring (generic limit: confirm in the service manual).',
    );
    expect(evaluateChargingVoltage({ volts: 15.6 }).reason).toContain('overcharging');
    expect(evaluateChargingVoltage({ volts: 15.6 }).reason).toContain('regulator/rectifier');
  });

  it('refuses readings that are not numbers and a band turned round', () => {
    expect(() => evaluateChargingVoltage({ volts: Number.NaN })).toThrow(RangeError);
    expect(() => evaluateChargingVoltage({ volts: 14, maxVolts: Number.POSITIVE_INFINITY })).toThrow(
      RangeError,
    );
    expect(() => evaluateChargingVoltage({ volts: 14, minVolts: 14.5, maxVolts: 13.5 })).toThrow(RangeError);
  });
});
