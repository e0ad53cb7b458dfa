/**
 * Service reminders: an item (fuel filter, strainer, oil) is due by distance, engine hours or
 * months, whichever comes first (PRODUCT.md, "Service reminders"). Dates are calendar dates with
 * no time of day; `today` is passed in so the answer never depends on the clock.
 */
import { addMonths, differenceInCalendarDays, formatISO, isValid, parseISO } from 'date-fns';
import { convert } from '../units';
import { clean, round, type Evaluation, type Verdict } from './types';

export type MeterUnit = 'mi' | 'km' | 'h';
export type IntervalStatus = 'ok' | 'due_soon' | 'due' | 'overdue';
type LimitKind = 'distance' | 'hours' | 'months';

export interface ServiceIntervalInput {
  everyKm?: number | null;
  everyHours?: number | null;
  everyMonths?: number | null;
  /** YYYY-MM-DD */
  lastDoneOn: string;
  lastDoneMeter?: number | null;
  meterUnit: MeterUnit;
  currentMeter?: number | null;
  /** YYYY-MM-DD */
  today: string;
}

export type ServiceIntervalFigures = {
  status: IntervalStatus;
  dueBy: LimitKind | null;
  dueOn: string | null;
  dueAtMeter: number | null;
  remainingDays: number | null;
  remainingMeter: number | null;
};

/** Warn this close to a limit: the last tenth of any interval, or 30 days before a date (brief). */
const SOON_FRACTION = 0.1;
const SOON_DAYS = 30;

const STATUS_RANK: Record<IntervalStatus, number> = { ok: 0, due_soon: 1, due: 2, overdue: 3 };
const STATUS_VERDICT: Record<IntervalStatus, Verdict> = {
  ok: 'pass',
  due_soon: 'warn',
  due: 'fail',
  overdue: 'fail',
};
const METER_WORDS: Record<MeterUnit, string> = { mi: 'mi', km: 'km', h: 'h' };

/** One limit that could be judged: how much of it is left and what that means. */
interface JudgedLimit {
  kind: LimitKind;
  status: IntervalStatus;
  /** Remaining ÷ interval, to find the limit that comes first. */
  fractionLeft: number;
  describe: () => string;
}

function parseDate(text: string, name: string): Date {
  const date = parseISO(text);
  // The round trip refuses 2026-02-30 and anything with a time or zone attached.
  if (!/^\d{4}-\d{2}-\d{2}$/.test(text) || !isValid(date) || isoDate(date) !== text) {
    throw new RangeError(`${name} must be a calendar date YYYY-MM-DD, got "${text}"`);
  }
  return date;
}

function isoDate(date: Date): string {
  return formatISO(date, { representation: 'date' });
}

function optionalPositive(value: number | null | undefined, name: string): number | null {
  if (value === null || value === undefined) return null;
  if (!Number.isFinite(value) || value <= 0) throw new RangeError(`${name} must be positive, got ${value}`);
  return value;
}

function optionalReading(value: number | null | undefined, name: string): number | null {
  if (value === null || value === undefined) return null;
  if (!Number.isFinite(value) || value < 0)
    throw new RangeError(`${name} must not be negative, got ${value}`);
  return value;
}

function statusFor(remaining: number, interval: number, soonAbsolute = 0): IntervalStatus {
  if (remaining < 0) return 'overdue';
  if (remaining === 0) return 'due';
  if (remaining <= interval * SOON_FRACTION || remaining <= soonAbsolute) return 'due_soon';
  return 'ok';
}

function meterLimitText(status: IntervalStatus, remaining: number, dueAt: number, unit: string): string {
  const at = `${round(dueAt, 1)} ${unit}`;
  if (status === 'overdue') return `overdue by ${round(-remaining, 1)} ${unit} (was due at ${at})`;
  if (status === 'due') return `reached ${at}`;
  return `${round(remaining, 1)} ${unit} to go (due at ${at})`;
}

function dateLimitText(status: IntervalStatus, remainingDays: number, dueOn: string): string {
  if (status === 'overdue') return `overdue by ${-remainingDays} days (was due on ${dueOn})`;
  if (status === 'due') return `today is the due date (${dueOn})`;
  return `${remainingDays} days to go (due on ${dueOn})`;
}

const HEADLINE: Record<IntervalStatus, string> = {
  ok: 'Not due yet',
  due_soon: 'Due soon',
  due: 'Due now',
  overdue: 'Overdue',
};

/**
 * When a service item is next due. Throws RangeError for a date that is not YYYY-MM-DD, an
 * interval that is not positive (months must be whole), or a negative or non-finite meter reading.
 * A limit that cannot be judged (no meter reading, or an hours limit on a machine with an
 * odometer) is skipped; when none can be judged the verdict is warn with status 'ok' and dueBy null.
 */
export function evaluateServiceInterval(input: ServiceIntervalInput): Evaluation<ServiceIntervalFigures> {
  const lastDone = parseDate(input.lastDoneOn, 'lastDoneOn');
  const today = parseDate(input.today, 'today');
  const everyKm = optionalPositive(input.everyKm, 'everyKm');
  const everyHours = optionalPositive(input.everyHours, 'everyHours');
  const everyMonths = optionalPositive(input.everyMonths, 'everyMonths');
  if (everyMonths !== null && !Number.isInteger(everyMonths)) {
    throw new RangeError(`everyMonths must be a whole number, got ${everyMonths}`);
  }
  const lastMeter = optionalReading(input.lastDoneMeter, 'lastDoneMeter');
  const currentMeter = optionalReading(input.currentMeter, 'currentMeter');
  const { meterUnit } = input;

  const limits: JudgedLimit[] = [];
  let dueOn: string | null = null;
  let remainingDays: number | null = null;
  let dueAtMeter: number | null = null;
  let remainingMeter: number | null = null;

  // The machine has one meter: an odometer (distance limit) or an hour meter (hours limit).
  const meterKind: LimitKind = meterUnit === 'h' ? 'hours' : 'distance';
  const meterInterval =
    meterUnit === 'h' ? everyHours : everyKm === null ? null : convert(everyKm, 'km', meterUnit);
  if (meterInterval !== null && lastMeter !== null) {
    const dueAt = clean(lastMeter + meterInterval);
    dueAtMeter = round(dueAt, 1);
    if (currentMeter !== null) {
      const remaining = clean(dueAt - currentMeter);
      const status = statusFor(remaining, meterInterval);
      remainingMeter = round(remaining, 1);
      limits.push({
        kind: meterKind,
        status,
        fractionLeft: remaining / meterInterval,
        describe: () => meterLimitText(status, remaining, dueAt, METER_WORDS[meterUnit]),
      });
    }
  }

  if (everyMonths !== null) {
    const due = addMonths(lastDone, everyMonths);
    const intervalDays = differenceInCalendarDays(due, lastDone);
    const days = differenceInCalendarDays(due, today);
    const status = statusFor(days, intervalDays, SOON_DAYS);
    dueOn = isoDate(due);
    remainingDays = days;
    const shownDueOn = dueOn;
    limits.push({
      kind: 'months',
      status,
      fractionLeft: days / intervalDays,
      describe: () => dateLimitText(status, days, shownDueOn),
    });
  }

  const first = comesFirst(limits);
  const figures: ServiceIntervalFigures = {
    status: first?.status ?? 'ok',
    dueBy: first?.kind ?? null,
    dueOn,
    dueAtMeter,
    remainingDays,
    remainingMeter,
  };
  if (!first) {
    return { verdict: 'warn', reason: cannotJudge(meterUnit, everyKm, everyHours), figures };
  }
  const others = limits.filter((limit) => limit !== first).map((limit) => limit.describe());
  const rest = others.length > 0 ? `; ${others.join('; ')}, whichever comes first` : '';
  return {
    verdict: STATUS_VERDICT[first.status],
    reason: `${HEADLINE[first.status]}: ${first.describe()}${rest}`,
    figures,
  };
}

/**
 * The limit that comes first: the most urgent status (a date 30 days off is flagged before a
 * tenth of its interval), then the smallest share of its interval left.
 */
function comesFirst(limits: readonly JudgedLimit[]): JudgedLimit | undefined {
  return [...limits].sort(
    (a, b) => STATUS_RANK[b.status] - STATUS_RANK[a.status] || a.fractionLeft - b.fractionLeft,
  )[0];
}

function cannotJudge(meterUnit: MeterUnit, everyKm: number | null, everyHours: number | null): string {
  if (meterUnit === 'h' && everyKm !== null && everyHours === null) {
    return 'Cannot judge: the interval is by distance but this machine has an hour meter; add an hours or months limit';
  }
  if (meterUnit !== 'h' && everyHours !== null && everyKm === null) {
    return 'Cannot judge: the interval is by engine hours but this machine has an odometer; add a distance or months limit';
  }
  if (everyKm === null && everyHours === null) {
    return 'Cannot judge: no interval is set; add one by distance, hours or months';
  }
  return `Cannot judge: record the ${meterUnit === 'h' ? 'hour meter' : 'odometer'} reading at the last service and now`;
}
