import { describe, expect, it } from 'vitest';
import { evaluatePrimeRun } from '../../../shared/evaluators/prime-run';

describe('evaluatePrimeRun', () => {
  it('fails when the pump does not run at key-on', () => {
    // PRODUCT.md, "Fuel delivery check": no prime run leads to the connector voltage test.
    expect(evaluatePrimeRun({ ran: false })).toEqual({
      verdict: 'fail',
      reason: 'No prime run at key-on.',
      figures: { ran: false, seconds: null, stoppedByItself: null },
    });
    // Timings given for a run that did not happen are dropped, not judged.
    expect(evaluatePrimeRun({ ran: false, seconds: 3, stoppedByItself: true }).figures).toEqual({
      ran: false,
      seconds: null,
      stoppedByItself: null,
    });
  });

  // About 2–3 s is typical (REFERENCES.md, "Fuel delivery"); 1–5 s normal, past 10 s running on —
  // common practice, no published source.
  it.each([
    { seconds: 2.5, stoppedByItself: true, verdict: 'pass' }, // the typical prime
    { seconds: 1, stoppedByItself: true, verdict: 'pass' }, // lower edge, inclusive
    { seconds: 5, stoppedByItself: true, verdict: 'pass' }, // upper edge, inclusive
    { seconds: 3, stoppedByItself: undefined, verdict: 'pass' }, // "did it stop" not recorded
    { seconds: 0.99, stoppedByItself: true, verdict: 'warn' }, // too short
    { seconds: 0.4, stoppedByItself: true, verdict: 'warn' },
    { seconds: 5.01, stoppedByItself: true, verdict: 'warn' }, // longer than usual
    { seconds: 10, stoppedByItself: true, verdict: 'warn' }, // still "long", not yet running on
    { seconds: 10.01, stoppedByItself: true, verdict: 'warn' }, // running on
    { seconds: 30, stoppedByItself: undefined, verdict: 'warn' },
    { seconds: 3, stoppedByItself: false, verdict: 'warn' }, // normal time, but did not stop
  ] as const)(
    '$seconds s, stopped by itself $stoppedByItself: $verdict',
    ({ seconds, stoppedByItself, verdict }) => {
      const result = evaluatePrimeRun({ ran: true, seconds, stoppedByItself });
      expect(result.verdict).toBe(verdict);
      expect(result.figures).toEqual({ ran: true, seconds, stoppedByItself: stoppedByItself ?? null });
    },
  );

  it('names the causes when the pump runs on', () => {
    // Pump keeps running: pressure not building, a leak, or relay/ECU control (decided with the lead).
    for (const input of [
      { ran: true, seconds: 3, stoppedByItself: false },
      { ran: true, seconds: 15 },
      { ran: true, stoppedByItself: false },
    ]) {
      expect(evaluatePrimeRun(input).reason).toContain('pressure not building, a leak, or relay/ECU control');
    }
    expect(evaluatePrimeRun({ ran: true, seconds: 7 }).reason).not.toContain('a leak');
  });

  it('writes the run with its time', () => {
    expect(evaluatePrimeRun({ ran: true, seconds: 2.5, stoppedByItself: true }).reason).toBe(
      'Pump ran 2.5 s at key-on: a normal prime, about 2–3 s being typical (generic limit: confirm in the service manual).',
    );
    expect(evaluatePrimeRun({ ran: true, seconds: 0.5 }).reason).toMatch(/^Pump ran only 0\.5 s at key-on/);
  });

  it('passes an untimed run that stopped by itself and asks for a time when nothing is known', () => {
    expect(evaluatePrimeRun({ ran: true, stoppedByItself: true }).verdict).toBe('pass');
    const unknown = evaluatePrimeRun({ ran: true });
    expect(unknown.verdict).toBe('warn');
    expect(unknown.figures).toEqual({ ran: true, seconds: null, stoppedByItself: null });
    expect(unknown.reason).toContain('time the run');
  });

  it.each([0, -1, Number.NaN, Number.POSITIVE_INFINITY])('refuses a run of %s s', (seconds) => {
    expect(() => evaluatePrimeRun({ ran: true, seconds })).toThrow(RangeError);
  });
});
