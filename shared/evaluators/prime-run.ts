/**
 * The fuel pump's prime run at key-on, engine not cranked: it should run briefly and stop
 * (PRODUCT.md, "Fuel delivery check"; REFERENCES.md, "Fuel delivery": about 2–3 s).
 *
 * Throws a RangeError when the pump ran but `seconds` is not a positive finite number.
 */
import type { Evaluation } from './types';

/**
 * About 2–3 s is typical (REFERENCES.md, "Fuel delivery"); 1–5 s is accepted as normal, past 10 s
 * the pump is taken to be running on — common practice, no published source.
 */
const NORMAL_MIN_SECONDS = 1;
const NORMAL_MAX_SECONDS = 5;
const RUN_ON_AFTER_SECONDS = 10;

const GENERIC_SUFFIX = ' (generic limit: confirm in the service manual)';
const RUN_ON_CAUSES = 'pressure not building, a leak, or relay/ECU control';

function requireRunSeconds(seconds: number): void {
  if (!Number.isFinite(seconds) || seconds <= 0) {
    throw new RangeError(`a prime run lasts a positive finite number of seconds, got ${seconds}`);
  }
}

type Judgement = Pick<Evaluation, 'verdict' | 'reason'>;

/** A pump that kept running outranks a short or long time. */
function judgeRanPrime(seconds: number | undefined, stoppedByItself: boolean | undefined): Judgement {
  if (stoppedByItself === false) {
    const ran = seconds === undefined ? 'Pump ran at key-on' : `Pump ran ${seconds} s at key-on`;
    return { verdict: 'warn', reason: `${ran} and did not stop by itself: ${RUN_ON_CAUSES}.` };
  }
  if (seconds === undefined) {
    return stoppedByItself
      ? { verdict: 'pass', reason: 'Pump ran at key-on and stopped by itself (run not timed).' }
      : { verdict: 'warn', reason: 'Pump ran at key-on: time the run and note whether it stops by itself.' };
  }
  if (seconds > RUN_ON_AFTER_SECONDS) {
    return {
      verdict: 'warn',
      reason: `Pump ran ${seconds} s at key-on, over ${RUN_ON_AFTER_SECONDS} s: it kept running — ${RUN_ON_CAUSES}${GENERIC_SUFFIX}.`,
    };
  }
  if (seconds < NORMAL_MIN_SECONDS) {
    return {
      verdict: 'warn',
      reason: `Pump ran only ${seconds} s at key-on, under the usual 2–3 s: a relay dropping out, low supply voltage or ECU control${GENERIC_SUFFIX}.`,
    };
  }
  if (seconds > NORMAL_MAX_SECONDS) {
    return {
      verdict: 'warn',
      reason: `Pump ran ${seconds} s at key-on, longer than the usual 2–3 s: pressure slow to build, or this machine primes longer${GENERIC_SUFFIX}.`,
    };
  }
  return {
    verdict: 'pass',
    reason: `Pump ran ${seconds} s at key-on: a normal prime, about 2–3 s being typical${GENERIC_SUFFIX}.`,
  };
}

/**
 * Without a time, a run that stopped by itself passes and an unknown one asks to be timed. When
 * the pump did not run, `seconds` and `stoppedByItself` mean nothing and are reported as null.
 */
export function evaluatePrimeRun(input: {
  ran: boolean;
  seconds?: number;
  stoppedByItself?: boolean;
}): Evaluation<{ ran: boolean; seconds: number | null; stoppedByItself: boolean | null }> {
  if (!input.ran) {
    return {
      verdict: 'fail',
      reason: 'No prime run at key-on.',
      figures: { ran: false, seconds: null, stoppedByItself: null },
    };
  }
  const { seconds, stoppedByItself } = input;
  if (seconds !== undefined) requireRunSeconds(seconds);
  const figures = { ran: true, seconds: seconds ?? null, stoppedByItself: stoppedByItself ?? null };
  return { ...judgeRanPrime(seconds, stoppedByItself), figures };
}
