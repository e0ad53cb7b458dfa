import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { lastDayOf, mondayOf, shiftWeek, weekFromParam } from '../../src/features/week/week-range';

// The weekday of a YYYY-MM-DD by JavaScript's own Date in UTC (ECMA-262), independent of date-fns
// which the code under test uses: 0 Sunday … 6 Saturday.
const weekdayOf = (iso: string) => new Date(`${iso}T00:00:00Z`).getUTCDay();
const daysBetween = (from: string, to: string) =>
  (Date.parse(`${to}T00:00:00Z`) - Date.parse(`${from}T00:00:00Z`)) / 86_400_000;

const today = new Date(2026, 10, 18, 15, 0); // Wednesday 2026-11-18, the demo seed's day

describe('the week picker’s weeks', () => {
  it.each([
    // ISO 8601: weeks start on Monday. Weekdays checked with weekdayOf above.
    ['2026-11-16', '2026-11-16'], // a Monday is its own week's start
    ['2026-11-18', '2026-11-16'], // Wednesday
    ['2026-11-22', '2026-11-16'], // Sunday belongs to the week before it, not after
    ['2027-01-01', '2026-12-28'], // across a year end (a Friday)
    ['2028-03-01', '2028-02-28'], // across a leap day (a Wednesday)
  ])('puts %s in the week of Monday %s', (day, monday) => {
    expect(weekdayOf(monday)).toBe(1);
    expect(weekFromParam(day, today)).toEqual({ start: monday, understood: true });
  });

  it('opens this week when the address names none, and says so when it names a bad date', () => {
    expect(weekFromParam(null, today)).toEqual({ start: '2026-11-16', understood: true });
    expect(weekFromParam('', today)).toEqual({ start: '2026-11-16', understood: true });
    for (const bad of ['2026-02-29', '2026-11-31', 'next', '2026-1-5']) {
      expect(weekFromParam(bad, today)).toEqual({ start: '2026-11-16', understood: false });
    }
  });

  it('always lands on a Monday within the six days before the day asked (property)', () => {
    fc.assert(
      fc.property(
        fc.date({ min: new Date(2000, 0, 1), max: new Date(2099, 11, 31), noInvalidDate: true }),
        (day) => {
          const local = new Date(day.getFullYear(), day.getMonth(), day.getDate());
          const iso = `${local.getFullYear()}-${String(local.getMonth() + 1).padStart(2, '0')}-${String(local.getDate()).padStart(2, '0')}`;
          const monday = mondayOf(local);
          expect(weekdayOf(monday)).toBe(1);
          expect(daysBetween(monday, iso)).toBeGreaterThanOrEqual(0);
          expect(daysBetween(monday, iso)).toBeLessThanOrEqual(6);
        },
      ),
    );
  });

  it('steps whole weeks, across months and a daylight-saving change', () => {
    // 2026-11-01 is the US fall-back date (Energy Policy Act of 2005: first Sunday in November).
    expect(shiftWeek('2026-10-26', 1)).toBe('2026-11-02');
    expect(shiftWeek('2026-11-16', -1)).toBe('2026-11-09');
    expect(shiftWeek('2026-12-28', 1)).toBe('2027-01-04');
    expect(lastDayOf('2026-11-16')).toBe('2026-11-22');
    expect(daysBetween('2026-10-26', shiftWeek('2026-10-26', 10))).toBe(70);
  });
});
