import { describe, expect, it } from 'vitest';
import {
  evaluateServiceInterval,
  type ServiceIntervalInput,
} from '../../../shared/evaluators/service-interval';

const byMonths = (lastDoneOn: string, everyMonths: number, today: string) =>
  evaluateServiceInterval({ everyMonths, lastDoneOn, meterUnit: 'mi', today });

describe('evaluateServiceInterval: months', () => {
  it.each([
    // Calendar (date-fns addMonths clamps to the month's last day): 31 Jan + 1 month = 28 Feb 2026.
    { last: '2026-01-31', months: 1, dueOn: '2026-02-28' },
    // Calendar: 2024 is a leap year, 2025 is not; 29 Feb 2024 + 12 months = 28 Feb 2025.
    { last: '2024-02-29', months: 12, dueOn: '2025-02-28' },
    // Calendar: 31 Aug 2026 + 6 months = 28 Feb 2027; 31 Oct + 1 month = 30 Nov.
    { last: '2026-08-31', months: 6, dueOn: '2027-02-28' },
    { last: '2026-10-31', months: 1, dueOn: '2026-11-30' },
  ])('$last + $months months is due on $dueOn', ({ last, months, dueOn }) => {
    expect(byMonths(last, months, last).figures.dueOn).toBe(dueOn);
  });

  it.each([
    // Due 2026-03-01 after 12 months (365 days). Days counted on a calendar:
    // 15 Jan → 1 Mar = 16 + 28 + 1 = 45 days; more than 30 days and more than 36.5 (10 %): ok.
    { today: '2026-01-15', days: 45, status: 'ok', verdict: 'pass' },
    // 1 Feb → 1 Mar = 28 days, inside the 30-day window: due soon.
    { today: '2026-02-01', days: 28, status: 'due_soon', verdict: 'warn' },
    { today: '2026-03-01', days: 0, status: 'due', verdict: 'fail' },
    // 1 Mar → 5 Mar = 4 days late.
    { today: '2026-03-05', days: -4, status: 'overdue', verdict: 'fail' },
  ] as const)('on $today: $days days, $status', ({ today, days, status, verdict }) => {
    const result = byMonths('2025-03-01', 12, today);
    expect(result.figures.remainingDays).toBe(days);
    expect(result.figures.status).toBe(status);
    expect(result.figures.dueBy).toBe('months');
    expect(result.verdict).toBe(verdict);
  });

  it('flags the last tenth of a long interval even before 30 days', () => {
    // 24 months from 2024-06-01 is 2026-06-01, 730 days (calendar); 10 % is 73 days.
    // 2026-04-01 → 2026-06-01 = 30 + 31 = 61 days.
    const result = byMonths('2024-06-01', 24, '2026-04-01');
    expect(result.figures.remainingDays).toBe(61);
    expect(result.figures.status).toBe('due_soon');
  });

  it('passes the 31 Jan + 1 month case on 28 Feb as due, not overdue', () => {
    // Calendar: the due date is 2026-02-28, so that day is "due" (0 days left).
    const result = byMonths('2026-01-31', 1, '2026-02-28');
    expect(result.figures.status).toBe('due');
    expect(result.reason).toBe('Due now: today is the due date (2026-02-28)');
  });
});

describe('evaluateServiceInterval: distance and hours', () => {
  const km = (currentMeter: number): ServiceIntervalInput => ({
    everyKm: 6000,
    lastDoneOn: '2026-01-10',
    lastDoneMeter: 10_000,
    meterUnit: 'km',
    currentMeter,
    today: '2026-02-01',
  });

  it.each([
    // Hand-worked: due at 10 000 + 6000 = 16 000 km; 10 % of 6000 is 600 km.
    { current: 15_000, remaining: 1000, status: 'ok' },
    { current: 15_400, remaining: 600, status: 'due_soon' },
    { current: 16_000, remaining: 0, status: 'due' },
    { current: 16_001, remaining: -1, status: 'overdue' },
  ] as const)('km odometer at $current: $remaining km left, $status', ({ current, remaining, status }) => {
    const result = evaluateServiceInterval(km(current));
    expect(result.figures.dueAtMeter).toBe(16_000);
    expect(result.figures.remainingMeter).toBe(remaining);
    expect(result.figures.status).toBe(status);
    expect(result.figures.dueBy).toBe('distance');
    expect(result.figures.dueOn).toBeNull();
  });

  it('converts a km interval to the machine’s miles', () => {
    // NIST SP 811 B.8: 1 mi = 1.609 344 km exactly, so 8046.72 km = 5000 mi.
    // Due at 12 000 + 5000 = 17 000 mi; at 16 500 mi, 500 mi (10 %) remain: due soon, inclusive.
    const result = evaluateServiceInterval({
      everyKm: 8046.72,
      lastDoneOn: '2026-01-10',
      lastDoneMeter: 12_000,
      meterUnit: 'mi',
      currentMeter: 16_500,
      today: '2026-02-01',
    });
    expect(result.figures.dueAtMeter).toBe(17_000);
    expect(result.figures.remainingMeter).toBe(500);
    expect(result.figures.status).toBe('due_soon');
    expect(result.reason).toBe('Due soon: 500 mi to go (due at 17000 mi)');
  });

  it('uses the hours limit on a machine with an hour meter and ignores distance there', () => {
    // Hand-worked: due at 100 + 50 = 150 h; at 149 h, 1 h left (2 % of 50): due soon.
    const result = evaluateServiceInterval({
      everyKm: 5000,
      everyHours: 50,
      lastDoneOn: '2026-01-10',
      lastDoneMeter: 100,
      meterUnit: 'h',
      currentMeter: 149,
      today: '2026-02-01',
    });
    expect(result.figures).toMatchObject({
      dueBy: 'hours',
      dueAtMeter: 150,
      remainingMeter: 1,
      status: 'due_soon',
    });
  });

  it('takes whichever limit comes first', () => {
    // Distance overdue (16 500 > 16 000 km) while the 12-month date is months away.
    const overdue = evaluateServiceInterval({ ...km(16_500), everyMonths: 12 });
    expect(overdue.figures.status).toBe('overdue');
    expect(overdue.figures.dueBy).toBe('distance');
    expect(overdue.figures.dueOn).toBe('2027-01-10'); // calendar: 10 Jan 2026 + 12 months
    expect(overdue.reason).toMatch(
      /^Overdue: overdue by 500 km \(was due at 16000 km\); .* whichever comes first$/,
    );
    // 3000 km of 6000 left (50 %) against 3 months from 2025-11-10 = 2026-02-10, 9 days off.
    const byDate = evaluateServiceInterval({ ...km(13_000), everyMonths: 3, lastDoneOn: '2025-11-10' });
    expect(byDate.figures.dueBy).toBe('months');
    expect(byDate.figures.status).toBe('due_soon');
    expect(byDate.figures.remainingDays).toBe(9);
  });

  it('picks the limit with the smallest share left when both are ok', () => {
    // Distance: 2000 of 6000 km left (33.3 %). Date: 12 months from 2025-06-01 = 2026-06-01 (365 days);
    // from 2026-02-01, counted on a calendar: Feb 28 + Mar 31 + Apr 30 + May 31 = 120 days (32.9 %).
    const result = evaluateServiceInterval({ ...km(14_000), everyMonths: 12, lastDoneOn: '2025-06-01' });
    expect(result.figures.remainingDays).toBe(120);
    expect(result.figures.status).toBe('ok');
    // 120 / 365 = 0.329 < 2000 / 6000 = 0.333: the date comes first.
    expect(result.figures.dueBy).toBe('months');
  });

  it('skips a distance limit without a current reading but still shows where it falls due', () => {
    const result = evaluateServiceInterval({ ...km(0), currentMeter: null, everyMonths: 12 });
    expect(result.figures.dueBy).toBe('months');
    expect(result.figures.dueAtMeter).toBe(16_000);
    expect(result.figures.remainingMeter).toBeNull();
  });

  it('warns when no limit can be judged', () => {
    const noReading = evaluateServiceInterval({ ...km(0), currentMeter: null });
    expect(noReading.verdict).toBe('warn');
    expect(noReading.figures.dueBy).toBeNull();
    expect(noReading.reason).toMatch(/^Cannot judge/);
    const hoursOnOdometer = evaluateServiceInterval({ ...km(15_000), everyKm: null, everyHours: 50 });
    expect(hoursOnOdometer.verdict).toBe('warn');
    expect(hoursOnOdometer.reason).toMatch(/hours but this machine has an odometer/);
  });

  it.each([
    { name: 'a day that does not exist', input: { lastDoneOn: '2026-02-30' } },
    { name: 'a date without padding', input: { today: '2026-2-1' } },
    { name: 'a date with a time', input: { today: '2026-02-01T10:00:00Z' } },
    { name: 'a zero interval', input: { everyKm: 0 } },
    { name: 'a NaN interval', input: { everyMonths: Number.NaN } },
    { name: 'part of a month', input: { everyMonths: 1.5 } },
    { name: 'an infinite meter reading', input: { currentMeter: Number.POSITIVE_INFINITY } },
    { name: 'a negative meter reading', input: { lastDoneMeter: -1 } },
  ])('throws RangeError for $name', ({ input }) => {
    expect(() => evaluateServiceInterval({ ...km(15_000), ...input })).toThrow(RangeError);
  });
});
