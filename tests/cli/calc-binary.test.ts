import { execa } from 'execa';
import { describe, expect, it } from 'vitest';

/** Built once per run by the global setup. */
const BIN = 'cli/dist/vanbay.js';
/** Nothing listens on the discard port: any attempt to reach a server would fail. */
const OFFLINE = { VANBAY_URL: 'http://127.0.0.1:9' };

/** One spawn of the built binary: `node cli/dist/vanbay.js calc …`. */
const calc = (...args: string[]) => execa('node', [BIN, 'calc', ...args], { env: OFFLINE, reject: false });

async function calcJson(...args: string[]): Promise<Record<string, unknown>> {
  const result = await calc(...args, '--json');
  expect(result.stderr, args.join(' ')).toBe('');
  expect(result.exitCode, args.join(' ')).toBe(0);
  expect(result.stdout.split('\n'), args.join(' ')).toHaveLength(1);
  return JSON.parse(result.stdout) as Record<string, unknown>;
}

describe('vanbay calc as the built binary, offline', () => {
  it('converts, with a negative value read as a number, not an option', async () => {
    // NIST SP 811 B.8: 1 psi = 6.894 757 293 168 kPa exactly (REFERENCES.md).
    const kpa = await calcJson('convert', '1', 'psi', 'kPa');
    expect(Object.keys(kpa).sort()).toEqual(['unit', 'value']);
    expect(kpa.unit).toBe('kPa');
    expect(Math.abs((kpa.value as number) - 6.894757293168)).toBeLessThan(1e-10);
    // °F = °C × 9/5 + 32: −40 °F is −40 °C.
    expect(await calcJson('convert', '-40', 'F', 'C')).toEqual({ value: -40, unit: 'C' });
  });

  it('judges a pressure hold by the settled start and the lowest point', async () => {
    // CONTRACT.md's definition, by hand: start at the 45 s point (42.5), lowest 41 → 1.5 psi; the
    // 30 psi point at 420 s is after the 5 minutes and ignored.
    const out = await calcJson(
      'hold',
      '--points',
      '0:43,15:42,45:42.5,300:41,420:30',
      '--max-drop',
      '1.5',
      '--minutes',
      '5',
    );
    expect(out).toMatchObject({ verdict: 'pass', dropPsi: 1.5 });
  });

  it('checks the 49 CFR 565.15 worked example VIN', async () => {
    // REFERENCES.md: 1M8GDM9AXKP042788 is valid, check digit X; position 10 K = 1989 or 2019.
    expect(await calcJson('vin', '1M8GDM9AXKP042788')).toEqual({
      valid: true,
      checkDigit: 'X',
      modelYears: [1989, 2019],
    });
  });

  it('works out a mileage deduction at the IRS rate, and prints a human line without --json', async () => {
    // IRS Notice 2026-10: 72.5 ¢/mi (REFERENCES.md); 1234.5 × 72.5 = 89 501.25 ¢ → 89 501 ¢ half up.
    expect(await calcJson('mileage', '1234.5', '--year', '2026')).toMatchObject({
      rateCentsPerMile: 72.5,
      deductionCents: 89501,
    });
    const human = await calc('mileage', '1234.5', '--year', '2026');
    expect(human.exitCode).toBe(0);
    expect(human.stderr).toBe('');
    expect(human.stdout).toBe('$895.01 at 72.5 ¢/mi');
  });

  it('exits 2 with one line on stderr, nothing on stdout and no stack for bad input', async () => {
    const cases = [
      ['convert', '1', 'psi', 'L', '--json'], // pressure to volume
      ['mileage', '100', '--year', '2022', '--json'], // two IRS rates that year (REFERENCES.md)
      ['hold', '--points', '0:43,30:42,30:41', '--max-drop', '1', '--minutes', '5'], // a time twice
    ];
    for (const argv of cases) {
      const result = await calc(...argv);
      expect(result.exitCode, argv.join(' ')).toBe(2);
      expect(result.stdout, argv.join(' ')).toBe('');
      expect(result.stderr.trim().split('\n'), argv.join(' ')).toHaveLength(1);
      expect(result.stderr, argv.join(' ')).not.toMatch(/\bat .*\.js:\d+/);
    }
  });
});
