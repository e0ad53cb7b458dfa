import Decimal from 'decimal.js';
import fc from 'fast-check';
import { unit } from 'mathjs';
import { describe, expect, it, vi } from 'vitest';
// @ts-expect-error -- vin-validator ships no type declarations; its one function is typed below.
import vinValidator from 'vin-validator';
import { runConvert, runHold, runMileage, runVin } from '../../cli/actions/calc';
import { runCli } from '../../cli/program';
import { fakeDeps } from '../helpers/cli';

const validateWithLibrary: (vin: string) => boolean = vinValidator.validate;

// NIST SP 811, Appendix B.8, and the exact definitions behind it (REFERENCES.md, "Units").
const KPA_PER_PSI = 6.894757293168;
const L_PER_GAL = 3.785411784;
const ML_PER_FLOZ = 29.5735295625;
const KM_PER_MI = 1.609344;

/** Runs `vanbay calc …` with a fetch that throws, so any network use shows as a failure. */
async function calc(...args: string[]) {
  const network = vi.fn<typeof fetch>(async () => {
    throw new Error('calc must not touch the network');
  });
  const io = fakeDeps(network, { VANBAY_URL: 'http://127.0.0.1:9' });
  const code = await runCli(['calc', ...args], io.deps);
  expect(network).not.toHaveBeenCalled();
  return { code, stdout: io.stdout(), stderr: io.stderr() };
}

/** `calc … --json`: exit 0, exactly one JSON line on stdout, nothing on stderr. */
async function calcJson(...args: string[]): Promise<Record<string, unknown>> {
  const result = await calc(...args, '--json');
  expect(result.stderr, args.join(' ')).toBe('');
  expect(result.code, args.join(' ')).toBe(0);
  const lines = result.stdout.split('\n');
  expect(lines, args.join(' ')).toHaveLength(2);
  expect(lines[1]).toBe('');
  return JSON.parse(lines[0]!) as Record<string, unknown>;
}

/** Bad input: exit 2, exactly one line on stderr, nothing on stdout (CONTRACT.md, exit codes). */
async function expectBadInput(...args: string[]) {
  for (const argv of [args, [...args, '--json']]) {
    const result = await calc(...argv);
    expect(result.code, argv.join(' ')).toBe(2);
    expect(result.stdout, argv.join(' ')).toBe('');
    expect(result.stderr.endsWith('\n'), argv.join(' ')).toBe(true);
    expect(result.stderr.trim().split('\n'), argv.join(' ')).toHaveLength(1);
    expect(result.stderr, argv.join(' ')).not.toMatch(/\bat .*:\d+:\d+/);
  }
}

/** |actual − expected| within `relative` of expected (absolute near zero). */
function expectNear(actual: unknown, expected: number, relative: number) {
  expect(typeof actual).toBe('number');
  const tolerance = relative * Math.max(1, Math.abs(expected));
  expect(Math.abs((actual as number) - expected), `${String(actual)} vs ${expected}`).toBeLessThanOrEqual(
    tolerance,
  );
}

/** Our unit names as mathjs spells them (mathjs's gal and floz are the US liquid units). */
const MATHJS_NAME: Record<string, string> = { F: 'degF', C: 'degC' };
const mathjsConvert = (value: number, from: string, to: string) =>
  unit(value, MATHJS_NAME[from] ?? from).toNumber(MATHJS_NAME[to] ?? to);

describe('vanbay calc convert', () => {
  it.each([
    // [value, from, to, expected from the exact definitions — NIST SP 811 B.8 (REFERENCES.md)]
    ['1', 'psi', 'kPa', KPA_PER_PSI],
    ['43', 'psi', 'kPa', 43 * KPA_PER_PSI],
    ['100', 'kPa', 'psi', 100 / KPA_PER_PSI], // 1 bar = 14.503 773 773 psi (REFERENCES.md)
    ['1', 'bar', 'psi', 14.503773773],
    ['1', 'bar', 'kPa', 100], // 1 bar = 100 kPa exactly
    ['43', 'psi', 'bar', (43 * KPA_PER_PSI) / 100],
    ['3', 'bar', 'psi', 300 / KPA_PER_PSI],
    ['1', 'gal', 'L', L_PER_GAL],
    ['1', 'gal', 'mL', L_PER_GAL * 1000],
    ['1', 'gal', 'floz', 128], // 1 US fl oz = 1/128 gal
    ['1', 'floz', 'mL', ML_PER_FLOZ],
    ['1', 'L', 'floz', 1000 / ML_PER_FLOZ],
    ['250', 'mL', 'L', 0.25],
    ['1', 'gal/h', 'L/h', L_PER_GAL],
    ['1000', 'mL/min', 'L/h', 60], // 1000 mL/min × 60 min/h ÷ 1000 mL/L
    ['1', 'L/h', 'mL/min', 1000 / 60],
    ['1', 'gal/h', 'mL/min', (L_PER_GAL * 1000) / 60],
    ['30', 'L/h', 'gal/h', 30 / L_PER_GAL],
    ['1', 'mi', 'km', KM_PER_MI],
    ['100', 'km', 'mi', 100 / KM_PER_MI],
    ['212', 'F', 'C', 100], // °F = °C × 9/5 + 32
    ['32', 'F', 'C', 0],
    ['37', 'C', 'F', 98.6],
    ['-40', 'F', 'C', -40],
    ['-40', 'C', 'F', -40],
    ['-10', 'C', 'F', 14],
    ['0', 'psi', 'kPa', 0],
  ])('%s %s → %s is %d (NIST SP 811 B.8), and agrees with mathjs', async (value, from, to, expected) => {
    const out = await calcJson('convert', value, from, to);
    // CONTRACT.md: exactly {"value": n, "unit": "TO"}.
    expect(Object.keys(out).sort()).toEqual(['unit', 'value']);
    expect(out.unit).toBe(to);
    // NIST SP 811 B.8 exact definitions; the CLI strips float noise at 12 significant digits.
    expectNear(out.value, expected, 1e-10);
    // Cross-check: mathjs units, relative 1e-6 (REFERENCES.md).
    expectNear(out.value, mathjsConvert(Number(value), from, to), 1e-6);
  });

  it('reads unit names without regard to case and prints the TO unit by its contract name', async () => {
    // NIST SP 811 B.8: 1 psi = 6.894 757 293 168 kPa; 1 US gal = 3 785.411 784 mL.
    const kpa = await calcJson('convert', '1', 'PSI', 'KPA');
    expect(kpa.unit).toBe('kPa');
    expectNear(kpa.value, KPA_PER_PSI, 1e-10);
    const ml = await calcJson('convert', '2', 'GAL', 'ml');
    expect(ml).toEqual({ value: expect.any(Number), unit: 'mL' });
    expectNear(ml.value, 2 * L_PER_GAL * 1000, 1e-10);
    const lph = await calcJson('convert', '1', 'GAL/H', 'l/h');
    expect(lph.unit).toBe('L/h');
    expectNear(lph.value, L_PER_GAL, 1e-10);
    const celsius = await calcJson('convert', '-40', 'f', 'c');
    // °F = °C × 9/5 + 32: −40 is the same on both scales.
    expect(celsius).toEqual({ value: -40, unit: 'C' });
  });

  it('prints a human line without --json', async () => {
    const result = await calc('convert', '100', 'km', 'mi');
    expect(result.code).toBe(0);
    expect(result.stderr).toBe('');
    // 100 km ÷ 1.609 344 km/mi = 62.137 119 2… mi (NIST SP 811 B.8), shown to four decimals.
    expect(result.stdout).toBe('62.1371 mi\n');
  });

  it('refuses an unknown unit, a unit of another kind and a value that is not a number (exit 2)', async () => {
    await expectBadInput('convert', '1', 'furlong', 'km');
    await expectBadInput('convert', '1', 'psi', 'parsec');
    await expectBadInput('convert', '1', 'psi', 'L'); // pressure to volume has no answer
    await expectBadInput('convert', '1', 'mi', 'C');
    await expectBadInput('convert', '1', 'gal/h', 'gal');
    // mV and s are Vanbay units but not among calc convert's (CONTRACT.md lists its units).
    await expectBadInput('convert', '1', 'V', 'mV');
    await expectBadInput('convert', 'abc', 'psi', 'kPa');
    await expectBadInput('convert', '12,5', 'psi', 'kPa');
    await expectBadInput('convert', '1', 'psi');
  });

  const UNIT_GROUPS = [
    ['psi', 'kPa', 'bar'],
    ['mL', 'L', 'gal', 'floz'],
    ['L/h', 'mL/min', 'gal/h'],
    ['mi', 'km'],
    ['F', 'C'],
  ];
  const unitPair = fc
    .constantFrom(...UNIT_GROUPS)
    .chain((group) => fc.tuple(fc.constantFrom(...group), fc.constantFrom(...group)));
  /** Decimals as a mechanic types them: up to 3 places, within ±1 000 000. */
  const typedValue = fc
    .tuple(fc.integer({ min: -1_000_000_000, max: 1_000_000_000 }), fc.integer({ min: 0, max: 3 }))
    .map(([units, places]) => new Decimal(units).div(1000).toFixed(places));
  /** Plain decimal text for a number, since VALUE does not take exponent notation. */
  const plain = (value: number) => value.toFixed(30);

  it('round-trips any typed value through any pair of units, and agrees with mathjs (fast-check)', () => {
    fc.assert(
      fc.property(typedValue, unitPair, (text, [from, to]) => {
        const there = runConvert(text, from, to);
        const back = runConvert(plain(there.value), to, from);
        const value = Number(text);
        // Round trip: two conversions with 12 significant digits kept each time.
        expectNear(back.value, value, 1e-9);
        // Cross-check: mathjs units, relative 1e-6 (REFERENCES.md, "Units").
        expectNear(there.value, mathjsConvert(value, from, to), 1e-6);
        expect(there.unit).toBe(to);
      }),
      { numRuns: 500 },
    );
  });
});

describe('vanbay calc battery', () => {
  it.each([
    // Open-circuit voltage, flooded, at rest, 80 °F — table attributed to the Battery Council
    // International (REFERENCES.md, "Battery"). Verdict bands (≥ 75 % pass, ≥ 50 % warn, else
    // fail) are Vanbay's: common practice, no published source.
    ['12.65', 100, 'pass'],
    ['12.45', 75, 'pass'],
    ['12.24', 50, 'warn'],
    ['12.06', 25, 'fail'],
    ['11.89', 0, 'fail'],
    // Interpolated between rows (REFERENCES.md: "interpolate between rows"), by hand:
    ['12.55', 87.5, 'pass'], // halfway 12.45–12.65 → halfway 75–100
    ['12.345', 62.5, 'warn'], // halfway 12.24–12.45 → halfway 50–75
    ['12.15', 37.5, 'fail'], // halfway 12.06–12.24 → halfway 25–50
    // Outside the table: no more than full, no less than empty.
    ['12.9', 100, 'pass'],
    ['11.5', 0, 'fail'],
  ])('flooded (the default) at %s V is %d %% charged, %s', async (volts, pct, verdict) => {
    const out = await calcJson('battery', volts);
    expect(out).toMatchObject({ stateOfChargePct: pct, verdict });
    expect(await calcJson('battery', volts, '--type', 'flooded')).toMatchObject({
      stateOfChargePct: pct,
      verdict,
    });
  });

  it('reads AGM higher than flooded: full about 12.8–13.0 V', async () => {
    // REFERENCES.md, "Battery": AGM reads higher (full about 12.8–13.0 V).
    expect(await calcJson('battery', '13.0', '--type', 'agm')).toMatchObject({
      stateOfChargePct: 100,
      verdict: 'pass',
    });
    const at128 = await calcJson('battery', '12.8', '--type', 'AGM');
    expect(at128.verdict).toBe('pass');
    expect(at128.stateOfChargePct as number).toBeGreaterThanOrEqual(90);
    // The same voltage means less charge on an AGM than on a flooded battery.
    const agm = await calcJson('battery', '12.45', '--type', 'agm');
    expect(agm.stateOfChargePct as number).toBeLessThan(75);
  });

  it('gives no percentage for lithium, and no pass in the flat band', async () => {
    // REFERENCES.md, "Battery": a LiFePO4 pack's flat curve makes voltage a poor guide to charge;
    // say so instead of guessing. The 12.8–13.2 V flat band is common practice, no published source.
    for (const volts of ['12.9', '13.0', '13.1']) {
      const out = await calcJson('battery', volts, '--type', 'lithium');
      expect(out.stateOfChargePct, volts).toBeNull();
      expect(out.verdict, volts).not.toBe('pass');
      expect(out.verdict, volts).toMatch(/^(warn|fail)$/);
    }
    for (const volts of ['13.4', '12.0']) {
      expect((await calcJson('battery', volts, '--type', 'lithium')).stateOfChargePct).toBeNull();
    }
    const human = await calc('battery', '13.0', '--type', 'lithium');
    expect(human.stdout).toMatch(/charge unknown/);
    expect(human.stdout).toMatch(/voltage cannot tell the charge/);
  });

  it('prints a human line without --json', async () => {
    const result = await calc('battery', '12.45');
    expect(result.code).toBe(0);
    expect(result.stderr).toBe('');
    // BCI table (REFERENCES.md): 12.45 V is 75 %.
    expect(result.stdout.split('\n')[0]).toMatch(/^75 % charged/);
  });

  it('refuses an unknown type or a reading that is not a number (exit 2)', async () => {
    await expectBadInput('battery', '12.6', '--type', 'gel');
    await expectBadInput('battery', 'twelve');
    await expectBadInput('battery', '12.6V');
    await expectBadInput('battery');
  });
});

describe('vanbay calc drop', () => {
  it.each([
    // dropVolts = supply − load, by hand; default limit 0.5 V for a whole feed
    // (REFERENCES.md, "Circuit voltage drop": common practice, no single published standard).
    [['12.6', '12.2'], 0.4, 'pass'],
    [['12.6', '12.1'], 0.5, 'pass'], // "no more than about 0.5 V": the limit itself passes
    [['12.6', '12.09'], 0.51, 'fail'],
    [['12.6', '11.9'], 0.7, 'fail'],
    [['12.6', '12.6'], 0, 'pass'],
    // --max overrides: 0.2 V per cable or section (same REFERENCES.md guidance).
    [['12.6', '12.2', '--max', '0.2'], 0.4, 'fail'],
    [['12.6', '12.4', '--max', '0.2'], 0.2, 'pass'],
    [['12.6', '11.9', '--max', '1'], 0.7, 'pass'],
    // A load end above the supply cannot happen on a loaded feed: asks for the readings again.
    [['12.2', '12.6'], -0.4, 'warn'],
  ])('calc drop %j is %d V, %s', async (args, drop, verdict) => {
    const out = await calcJson('drop', ...args);
    // toBe, not toBeCloseTo: 12.6 − 12.2 must come out as exactly 0.4, not 0.40000000000000036.
    expect(out.dropVolts).toBe(drop);
    expect(out.verdict).toBe(verdict);
  });

  it('prints a human line without --json', async () => {
    const result = await calc('drop', '12.6', '12.2');
    expect(result.code).toBe(0);
    expect(result.stderr).toBe('');
    // 12.6 − 12.2 = 0.4 by hand; default limit 0.5 V (REFERENCES.md, common practice).
    expect(result.stdout.split('\n')[0]).toMatch(/^0\.4 V drop \(limit 0\.5 V\)/);
  });

  it('refuses readings that are not numbers and a limit that is not above zero (exit 2)', async () => {
    await expectBadInput('drop', '12.6', 'low');
    await expectBadInput('drop', '12.6');
    await expectBadInput('drop', '12.6', '12.2', '--max', '0');
    await expectBadInput('drop', '12.6', '12.2', '--max', 'half');
  });
});

describe('vanbay calc lambda', () => {
  it.each([
    // Stoichiometric AFR by mass (REFERENCES.md, "Air-fuel ratio"); λ = AFR ÷ stoichiometric AFR
    // by hand; λ > 1 lean, λ < 1 rich (REFERENCES.md).
    ['14.7', 'gasoline', 14.7, 1, 'stoichiometric'],
    ['16.17', 'gasoline', 14.7, 16.17 / 14.7, 'lean'], // 1.1
    ['13.23', 'gasoline', 14.7, 13.23 / 14.7, 'rich'], // 0.9
    ['12.5', 'gasoline', 14.7, 12.5 / 14.7, 'rich'], // 0.8503
    ['14.1', 'e10', 14.1, 1, 'stoichiometric'],
    ['15', 'e10', 14.1, 15 / 14.1, 'lean'], // 1.0638
    ['9.8', 'e85', 9.8, 1, 'stoichiometric'],
    ['12', 'E85', 9.8, 12 / 9.8, 'lean'], // 1.2245
    ['8.5', 'e85', 9.8, 8.5 / 9.8, 'rich'], // 0.8673
    ['6.4', 'methanol', 6.4, 1, 'stoichiometric'],
    ['5.5', 'methanol', 6.4, 5.5 / 6.4, 'rich'], // 0.859375
  ])('AFR %s on %s: stoichiometric %d, λ %d, %s', async (afr, fuel, stoich, lambda, mixture) => {
    const out = await calcJson('lambda', afr, '--fuel', fuel);
    expect(out.stoichAfr).toBe(stoich);
    expect(out.mixture).toBe(mixture);
    // Shown to four places: within half a unit in the fourth place of the hand figure.
    expect(Math.abs((out.lambda as number) - lambda)).toBeLessThanOrEqual(0.00005 + 1e-12);
  });

  it('defaults to gasoline, 14.7 (REFERENCES.md)', async () => {
    expect(await calcJson('lambda', '14.7')).toMatchObject({
      lambda: 1,
      stoichAfr: 14.7,
      mixture: 'stoichiometric',
    });
    // 13.0 ÷ 14.7 = 0.8844 (hand arithmetic): rich.
    const rich = await calcJson('lambda', '13.0');
    expect(rich.stoichAfr).toBe(14.7);
    expect(rich.mixture).toBe('rich');
    expect(Math.abs((rich.lambda as number) - 13 / 14.7)).toBeLessThanOrEqual(0.00005);
  });

  it('calls a mixture lean or rich as soon as λ leaves the sensor tolerance', async () => {
    // λ = AFR ÷ 14.7 (REFERENCES.md); within ±0.5 % of 1 a wide-band sensor cannot tell lean from
    // rich — common practice, no published source.
    expect((await calcJson('lambda', '14.75')).mixture).toBe('stoichiometric'); // λ 1.0034
    expect((await calcJson('lambda', '14.8')).mixture).toBe('lean'); // λ 1.0068
    expect((await calcJson('lambda', '14.6')).mixture).toBe('rich'); // λ 0.9932
  });

  it('judges λ within ±5 % a pass and far lean a fail', async () => {
    // Verdict bands on λ: common practice, no published source.
    expect((await calcJson('lambda', '14.7')).verdict).toBe('pass');
    expect((await calcJson('lambda', '17.5')).verdict).toBe('fail'); // λ 1.19
    expect((await calcJson('lambda', '15.9')).verdict).toBe('warn'); // λ 1.08
  });

  it('prints a human line without --json', async () => {
    const result = await calc('lambda', '9.8', '--fuel', 'e85');
    expect(result.code).toBe(0);
    expect(result.stderr).toBe('');
    // E85 stoichiometric 9.8 (REFERENCES.md): λ 1.
    expect(result.stdout.split('\n')[0]).toMatch(/^λ 1 — stoichiometric \(stoichiometric 9\.8:1\)/);
  });

  it('refuses an unknown fuel and an AFR that is not a positive number (exit 2)', async () => {
    await expectBadInput('lambda', '14.7', '--fuel', 'diesel');
    await expectBadInput('lambda', '0');
    await expectBadInput('lambda', 'lean');
    await expectBadInput('lambda', '14.7:1');
  });
});

describe('vanbay calc hold', () => {
  // CONTRACT.md: dropPsi = the pressure at the first point at or after 30 s minus the lowest
  // pressure from then to M minutes; above --max-drop fails. Each expected drop is by hand.
  const hold = (points: string, maxDrop: string, minutes = '5') =>
    calcJson('hold', '--points', points, '--max-drop', maxDrop, '--minutes', minutes);

  it('ignores a settling drop before 30 s', async () => {
    // 45 → 43 psi in the first 20 s is settling; from 30 s on it holds at 43: drop 0.
    const out = await hold('0:45,10:43.5,20:43,30:43,150:43,300:43', '1');
    expect(out).toMatchObject({ verdict: 'pass', dropPsi: 0 });
  });

  it('passes a drop exactly at the limit and fails 0.1 psi over it', async () => {
    // 43 − 41.5 = 1.5 psi, limit 1.5: not above the limit, so it passes.
    expect(await hold('0:43.8,30:43,120:42.2,300:41.5', '1.5')).toMatchObject({
      verdict: 'pass',
      dropPsi: 1.5,
    });
    // 43 − 41.4 = 1.6 psi, 0.1 over the 1.5 limit: fails.
    expect(await hold('0:43.8,30:43,120:42.2,300:41.4', '1.5')).toMatchObject({
      verdict: 'fail',
      dropPsi: 1.6,
    });
  });

  it('takes the points in time order whatever order they are typed in', async () => {
    // The same series as above, shuffled: start at 30 s (43), lowest 41.5: drop 1.5.
    expect(await hold('300:41.5,30:43,0:43.8,120:42.2', '1.5')).toMatchObject({
      verdict: 'pass',
      dropPsi: 1.5,
    });
  });

  it('judges against the lowest point, not the last one', async () => {
    // 43 at 30 s, down to 40 at 120 s, back to 42 at 300 s: the drop is 43 − 40 = 3.
    expect(await hold('0:44,30:43,120:40,300:42', '2')).toMatchObject({ verdict: 'fail', dropPsi: 3 });
  });

  it('ignores a point after M minutes', async () => {
    // 5 minutes = 300 s: the 30 psi reading at 420 s is outside the test; drop 43 − 42 = 1.
    expect(await hold('0:43,30:43,300:42,420:30', '2', '5')).toMatchObject({ verdict: 'pass', dropPsi: 1 });
    // The same reading inside a 10-minute test counts: 43 − 30 = 13.
    expect(await hold('0:43,30:43,300:42,420:30,600:30', '2', '10')).toMatchObject({
      verdict: 'fail',
      dropPsi: 13,
    });
  });

  it('starts at the first point at or after 30 s when none is at 30 s exactly', async () => {
    // First point at or after 30 s is at 45 s (42.5), not the 15 s one (42): drop 42.5 − 41 = 1.5.
    expect(await hold('0:43,15:42,45:42.5,300:41', '1.5')).toMatchObject({ verdict: 'pass', dropPsi: 1.5 });
    expect(await hold('0:43,15:42,45:42.5,300:41', '1.4')).toMatchObject({ verdict: 'fail', dropPsi: 1.5 });
  });

  it('reads pressures given in bar', async () => {
    // 3.0 − 2.9 bar = 0.1 bar = 10 kPa = 10 ÷ 6.894 757 293 168 psi = 1.450 377 psi (NIST SP 811 B.8).
    const out = await hold('0:3bar,30:3bar,300:2.9bar', '1.5');
    expect(out.verdict).toBe('pass');
    expectNear(out.dropPsi, 10 / KPA_PER_PSI, 1e-6);
  });

  it('does not pass a test that stopped before M minutes or has no reading after settling', async () => {
    // Vanbay's choice, beyond CONTRACT.md: an unfinished series is provisional (warn), never pass.
    expect(await hold('0:43,30:43,200:42.5', '1.5')).toMatchObject({ verdict: 'warn', dropPsi: 0.5 });
    expect((await hold('0:43,10:42,20:41', '1.5')).verdict).toBe('warn');
  });

  it('prints a human line without --json', async () => {
    const result = await calc(
      'hold',
      '--points',
      '0:43.8,30:43,120:42.2,300:41.5',
      '--max-drop',
      '1.5',
      '--minutes',
      '5',
    );
    expect(result.code).toBe(0);
    expect(result.stderr).toBe('');
    // 43 − 41.5 = 1.5 by hand (CONTRACT.md's definition).
    expect(result.stdout.split('\n')[0]).toMatch(/^fell 1\.5 psi \(limit 1\.5 psi\)/);
  });

  it('refuses duplicate times and malformed points (exit 2)', async () => {
    const bad = (points: string, maxDrop = '1.5', minutes = '5') =>
      expectBadInput('hold', '--points', points, '--max-drop', maxDrop, '--minutes', minutes);
    await bad('0:43,30:42,30:41'); // two readings at 30 s
    await bad('0:43,30'); // no pressure
    await bad('0:43;30:42'); // wrong separator
    await bad('zero:43,30:42');
    await bad('0:43,30:high');
    await bad('0:43,,30:42');
    await bad('');
    await bad('0:43,30:12V'); // a voltage is not a pressure
    await bad('-5:43,30:42'); // time before the pump stopped
    await bad('0:43,30:42', 'abc');
    await bad('0:43,30:42', '-1');
    await bad('0:43,30:42', '1.5', '0.5'); // not longer than the 30 s settling window
    await expectBadInput('hold', '--points', '0:43,30:42', '--minutes', '5'); // no --max-drop
  });

  /** Series in psi with one decimal, as tenths, with a point inside [30 s, M minutes]. */
  const holdSeries = fc
    .record({
      minutes: fc.integer({ min: 1, max: 10 }),
      times: fc.uniqueArray(fc.integer({ min: 0, max: 900 }), { minLength: 1, maxLength: 12 }),
      tenths: fc.array(fc.integer({ min: 0, max: 900 }), { minLength: 12, maxLength: 12 }),
      maxDropTenths: fc.integer({ min: 0, max: 100 }),
      settled: fc.integer({ min: 30, max: 600 }),
    })
    .map(({ minutes, times, tenths, maxDropTenths, settled }) => {
      const inside = Math.min(settled, minutes * 60);
      const allTimes = times.includes(inside) ? times : [...times, inside];
      const points = allTimes.map((sec, i) => ({ sec, tenths: tenths[i % tenths.length]! }));
      return { minutes, points, maxDropTenths };
    });

  it('never gives a negative drop, and fails exactly when the drop is above the limit (fast-check)', () => {
    fc.assert(
      fc.property(holdSeries, ({ minutes, points, maxDropTenths }) => {
        const text = points.map((p) => `${p.sec}:${(p.tenths / 10).toFixed(1)}`).join(',');
        const out = runHold(text, (maxDropTenths / 10).toFixed(1), String(minutes));
        // CONTRACT.md's definition, computed here in whole tenths of a psi so it is exact.
        const sorted = [...points].sort((a, b) => a.sec - b.sec);
        const start = sorted.find((p) => p.sec >= 30)!;
        const window = sorted.filter((p) => p.sec >= start.sec && p.sec <= minutes * 60);
        const dropTenths = start.tenths - Math.min(...window.map((p) => p.tenths));
        expect(out.dropPsi).toBeGreaterThanOrEqual(0);
        expectNear(out.dropPsi, dropTenths / 10, 1e-9);
        expect(out.verdict === 'fail').toBe(dropTenths > maxDropTenths);
      }),
      { numRuns: 500 },
    );
  });
});

describe('vanbay calc flow', () => {
  it.each([
    // litersPerHour = mL ÷ 1000 × 3600 ÷ s, by hand. Generic minimum 30 L/h when the manual gives
    // none: common practice, no published source (REFERENCES.md, "Fuel delivery").
    [['--ml', '250', '--seconds', '30'], 30, 'pass'], // 0.25 L × 120 = 30: at the minimum passes
    [['--ml', '200', '--seconds', '30'], 24, 'fail'],
    [['--ml', '1000', '--seconds', '60'], 60, 'pass'],
    [['--ml', '333', '--seconds', '45'], 26.64, 'fail'], // 0.333 × 80
    [['--ml', '0', '--seconds', '30'], 0, 'fail'], // nothing collected
    [['--ml', '200', '--seconds', '30', '--min-lph', '20'], 24, 'pass'], // the manual's minimum
    [['--ml', '250', '--seconds', '30', '--min-lph', '40'], 30, 'fail'],
  ])('calc flow %j is %d L/h, %s', async (args, lph, verdict) => {
    const out = await calcJson('flow', ...args);
    expect(out.litersPerHour).toBe(lph);
    expect(out.verdict).toBe(verdict);
  });

  it('labels the default minimum generic and --min-lph the manual’s', async () => {
    // rules.md: a generic limit is labelled "(generic limit: confirm in the service manual)".
    const generic = await calcJson('flow', '--ml', '250', '--seconds', '30');
    expect(generic).toMatchObject({ minLph: 30, specSource: 'generic' });
    expect(generic.reason).toMatch(/\(generic limit: confirm in the service manual\)$/);
    const manual = await calcJson('flow', '--ml', '250', '--seconds', '30', '--min-lph', '25');
    expect(manual).toMatchObject({ minLph: 25, specSource: 'manual', verdict: 'pass' });
    expect(manual.reason).not.toMatch(/generic/);
  });

  it('prints a human line without --json', async () => {
    const result = await calc('flow', '--ml', '250', '--seconds', '30');
    expect(result.code).toBe(0);
    expect(result.stderr).toBe('');
    expect(result.stdout.split('\n')[0]).toMatch(/^30 L\/h \(minimum 30 L\/h\)/); // 250 mL in 30 s, by hand
  });

  it('refuses a time that is not above zero and values that are not numbers (exit 2)', async () => {
    await expectBadInput('flow', '--ml', '250', '--seconds', '0');
    await expectBadInput('flow', '--ml', '-5', '--seconds', '30');
    await expectBadInput('flow', '--ml', 'cup', '--seconds', '30');
    await expectBadInput('flow', '--ml', '250', '--seconds', '30', '--min-lph', '0');
    await expectBadInput('flow', '--ml', '250');
  });
});

describe('vanbay calc compression', () => {
  /** CONTRACT.md: spreadPct = (max − min) / max × 100, computed here by hand. */
  const spread = (...psi: number[]) => ((Math.max(...psi) - Math.min(...psi)) / Math.max(...psi)) * 100;

  it.each([
    // Verdict bands: within 10 % healthy, above 25 % (lowest under 75 % of the highest) a fault —
    // common practice, no published source (REFERENCES.md quotes 10–15 % and 70–75 %).
    [[165, 160, 158], 'pass'], // 4.24 %
    [[150, 150], 'pass'], // 0 %
    [[200, 180], 'pass'], // 10 %: within 10 %
    [[180, 150], 'warn'], // 16.67 %
    [[200, 150], 'warn'], // 25 %
    [[180, 120], 'fail'], // 33.3 %: lowest 66.7 % of the highest, under 70–75 %
    [[170, 168, 110, 166], 'fail'], // 35.3 %
  ])('readings %j psi spread by (max − min)/max, %s', async (psi, verdict) => {
    const out = await calcJson('compression', ...psi.map(String));
    // One decimal: within 0.05 of the hand figure.
    expect(Math.abs((out.spreadPct as number) - spread(...psi))).toBeLessThanOrEqual(0.05 + 1e-9);
    expect(out.verdict).toBe(verdict);
  });

  it('takes readings with units; the spread does not depend on the unit', async () => {
    // (1100 − 1000) / 1100 = 9.09 % (CONTRACT.md's formula, by hand).
    const out = await calcJson('compression', '1100kPa', '1000kPa');
    expect(out.spreadPct).toBe(9.1);
    expect(out.verdict).toBe('pass');
  });

  it('passes a single cylinder (nothing to compare)', async () => {
    expect(await calcJson('compression', '150')).toMatchObject({ spreadPct: 0, verdict: 'pass' });
  });

  it('prints a human line without --json', async () => {
    const result = await calc('compression', '180', '150');
    expect(result.code).toBe(0);
    expect(result.stderr).toBe('');
    expect(result.stdout.split('\n')[0]).toMatch(/^spread 16\.7 %/); // 30 ÷ 180 = 16.67 %, by hand
  });

  it('refuses zero, text and readings of another kind (exit 2)', async () => {
    await expectBadInput('compression', '165', '160', '0');
    await expectBadInput('compression', '165', 'low');
    await expectBadInput('compression', '165', '12V');
    await expectBadInput('compression');
  });
});

describe('vanbay calc vin', () => {
  it('checks the 49 CFR 565.15 worked example 1M8GDM9AXKP042788', async () => {
    // REFERENCES.md, "VIN — 49 CFR 565.15": valid, check digit X; position 10 K = 1989 or 2019.
    expect(await calcJson('vin', '1M8GDM9AXKP042788')).toEqual({
      valid: true,
      checkDigit: 'X',
      modelYears: [1989, 2019],
    });
    expect(validateWithLibrary('1M8GDM9AXKP042788')).toBe(true); // vin-validator agrees
    // Case does not matter to the check (the regulation's letters are capitals).
    expect(await calcJson('vin', '1m8gdm9axkp042788')).toMatchObject({ valid: true, checkDigit: 'X' });
  });

  it('accepts 11111111111111111, position 10 "1" = 2001 or 2031', async () => {
    // REFERENCES.md: 11111111111111111 is valid; the weights sum to 89, 89 mod 11 = 1 (hand
    // arithmetic); model year code 1 = 2001 or 2031.
    expect(await calcJson('vin', '11111111111111111')).toEqual({
      valid: true,
      checkDigit: '1',
      modelYears: [2001, 2031],
    });
  });

  it('names the right check digit when position 9 is wrong', async () => {
    // The worked example with position 9 changed from X to 1: invalid, should be X (49 CFR 565.15).
    expect(await calcJson('vin', '1M8GDM9A1KP042788')).toEqual({
      valid: false,
      checkDigit: 'X',
      modelYears: [1989, 2019],
    });
    expect(validateWithLibrary('1M8GDM9A1KP042788')).toBe(false); // vin-validator agrees
  });

  it.each([
    // Position 10 model year codes (REFERENCES.md, 49 CFR 565.15 30-year cycle).
    ['A', [1980, 2010]],
    ['K', [1989, 2019]],
    ['L', [1990, 2020]],
    ['Y', [2000, 2030]],
    ['1', [2001, 2031]],
    ['9', [2009, 2039]],
    ['U', []], // U, Z and 0 are not year codes
    ['Z', []],
    ['0', []],
  ])('position 10 %s stands for %j', async (code, years) => {
    const vin = `1M8GDM9AX${code}P042788`;
    expect((await calcJson('vin', vin)).modelYears).toEqual(years);
  });

  it('says not valid for text that cannot be a VIN (I, O, Q or not 17 characters)', async () => {
    // 49 CFR 565.15: 17 characters, never I, O or Q (REFERENCES.md); vin-validator agrees.
    for (const text of ['1M8GDM9AXKP04278O', '1M8GDM9AXKP04278', 'ABC']) {
      expect((await calcJson('vin', text)).valid, text).toBe(false);
      expect(validateWithLibrary(text), text).toBe(false);
    }
  });

  it('agrees with vin-validator on generated VINs (fast-check)', async () => {
    const VIN_ALPHABET = [...'ABCDEFGHJKLMNPRSTUVWXYZ0123456789'];
    const vinLike = fc.array(fc.constantFrom(...VIN_ALPHABET), { minLength: 17, maxLength: 17 });
    /** A body with position 9 set to what 49 CFR 565.15 asks, as the CLI names it. */
    const corrected = (chars: string[]) => {
      const digit = runVin(chars.join('')).checkDigit!;
      return [...chars.slice(0, 8), digit, ...chars.slice(9)].join('');
    };
    fc.assert(
      fc.property(vinLike, fc.boolean(), (chars, fix) => {
        const vin = fix ? corrected(chars) : chars.join('');
        const ours = runVin(vin);
        expect(ours.valid).toBe(validateWithLibrary(vin));
        if (fix) expect(ours.valid).toBe(true);
      }),
      { numRuns: 1000 },
    );
    // A few through the whole command as well.
    const samples = fc.sample(vinLike.map(corrected), { numRuns: 5, seed: 565 });
    for (const vin of samples) {
      const out = await calcJson('vin', vin);
      expect(out.valid, vin).toBe(validateWithLibrary(vin));
      expect(out.valid, vin).toBe(true);
    }
  });

  it('prints a human line without --json', async () => {
    const result = await calc('vin', '1M8GDM9A1KP042788');
    expect(result.code).toBe(0);
    expect(result.stderr).toBe('');
    expect(result.stdout).toMatch(/^not valid {2}check digit should be X {2}model year 1989 or 2019\n$/);
  });

  it('refuses a missing VIN (exit 2)', async () => {
    await expectBadInput('vin');
  });
});

describe('vanbay calc mileage', () => {
  it.each([
    // IRS business standard mileage rates (REFERENCES.md); deduction = miles × rate, rounded half
    // up to the cent, by hand.
    ['1000', '2023', 65.5, 65500], // Notice 2023-03
    ['0.5', '2023', 65.5, 33], // 32.75 → 33
    ['0.1', '2023', 65.5, 7], // 6.55 → 7
    ['100', '2024', 67, 6700], // Notice 2024-08
    ['12.345', '2024', 67, 827], // 827.115 → 827
    ['100', '2025', 70, 7000], // Notice 2025-05
    ['0.05', '2025', 70, 4], // 3.5 → 4 (half up, not to even)
    ['1', '2026', 72.5, 73], // Notice 2026-10; 72.5 → 73 (half up, not to even 72)
    ['1234.5', '2026', 72.5, 89501], // 89 501.25 → 89 501
    ['0', '2026', 72.5, 0],
  ])('%s mi in %s at %d ¢/mi is %d ¢', async (miles, year, rate, cents) => {
    const out = await calcJson('mileage', miles, '--year', year);
    expect(out).toMatchObject({ rateCentsPerMile: rate, deductionCents: cents });
    // Cross-check: decimal.js, exact decimal product rounded half up.
    const expected = new Decimal(miles).times(rate).toDecimalPlaces(0, Decimal.ROUND_HALF_UP).toNumber();
    expect(out.deductionCents).toBe(expected);
  });

  it('uses --rate instead of the published rate, for any year', async () => {
    // 100 mi × 70 ¢ = 7 000 ¢; 250 mi × 54.5 ¢ = 13 625 ¢ (hand arithmetic).
    expect(await calcJson('mileage', '100', '--year', '2026', '--rate', '70')).toMatchObject({
      rateCentsPerMile: 70,
      deductionCents: 7000,
    });
    expect(await calcJson('mileage', '250', '--year', '2018', '--rate', '54.5')).toMatchObject({
      rateCentsPerMile: 54.5,
      deductionCents: 13625,
    });
    // 2022 had two rates (REFERENCES.md, from memory): with --rate it is answerable. 10 × 62.5 = 625.
    expect(await calcJson('mileage', '10', '--year', '2022', '--rate', '62.5')).toMatchObject({
      deductionCents: 625,
    });
  });

  it('matches decimal.js for any miles with up to 3 decimals in each published year (fast-check)', () => {
    const RATES: Record<string, number> = { '2023': 65.5, '2024': 67, '2025': 70, '2026': 72.5 }; // REFERENCES.md
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 500_000_000 }),
        fc.integer({ min: 0, max: 3 }),
        fc.constantFrom(...Object.keys(RATES)),
        (thousandths, places, year) => {
          const miles = new Decimal(thousandths).div(1000).toFixed(places, Decimal.ROUND_DOWN);
          const out = runMileage(miles, year, undefined);
          const rate = RATES[year]!;
          expect(out.rateCentsPerMile).toBe(rate);
          // decimal.js: exact product, ROUND_HALF_UP to whole cents.
          const expected = new Decimal(miles)
            .times(rate)
            .toDecimalPlaces(0, Decimal.ROUND_HALF_UP)
            .toNumber();
          expect(out.deductionCents).toBe(expected);
        },
      ),
      { numRuns: 500 },
    );
  });

  it('prints a human line without --json', async () => {
    const result = await calc('mileage', '1234.5', '--year', '2026');
    expect(result.code).toBe(0);
    expect(result.stderr).toBe('');
    expect(result.stdout).toBe('$895.01 at 72.5 ¢/mi\n'); // 1234.5 × 72.5 ¢ = 89 501.25 ¢, by hand
  });

  it('refuses an unknown tax year, a year with two rates and bad numbers without --rate (exit 2)', async () => {
    await expectBadInput('mileage', '100', '--year', '2018'); // no rate known
    await expectBadInput('mileage', '100', '--year', '2040');
    await expectBadInput('mileage', '100', '--year', '2022'); // 58.5 ¢ then 62.5 ¢ (REFERENCES.md)
    await expectBadInput('mileage', '100');
    await expectBadInput('mileage', '100', '--year', '26');
    await expectBadInput('mileage', 'ten', '--year', '2026');
    await expectBadInput('mileage', '1,234', '--year', '2026');
    await expectBadInput('mileage', '1.2345', '--year', '2026');
    await expectBadInput('mileage', '100', '--year', '2026', '--rate', 'free');
  });
});

describe('every vanbay calc command', () => {
  const ROWS: string[][] = [
    ['convert', '43', 'psi', 'kPa'],
    ['battery', '12.5'],
    ['drop', '12.6', '12.2'],
    ['lambda', '14.7'],
    ['hold', '--points', '0:43,30:43,300:42', '--max-drop', '2', '--minutes', '5'],
    ['flow', '--ml', '250', '--seconds', '30'],
    ['compression', '165', '160'],
    ['vin', '1M8GDM9AXKP042788'],
    ['mileage', '100', '--year', '2026'],
  ];

  it.each(ROWS)('%s: --json prints one JSON line, nothing on stderr, and no network', async (...row) => {
    await calcJson(...row);
  });

  it.each(ROWS)('%s: without --json prints a human line, not JSON', async (...row) => {
    const result = await calc(...row);
    expect(result.code).toBe(0);
    expect(result.stderr).toBe('');
    const first = result.stdout.split('\n')[0]!;
    expect(first.trim().length).toBeGreaterThan(0);
    expect(() => JSON.parse(first)).toThrow();
  });

  it('refuses an unknown calculator and an unknown option (exit 2)', async () => {
    await expectBadInput('torque', '10');
    await expectBadInput('convert', '1', 'psi', 'kPa', '--precise');
  });
});
