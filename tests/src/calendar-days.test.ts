import { TZDate } from '@date-fns/tz';
import { format } from 'date-fns';
import { describe, expect, it } from 'vitest';
import { todayIn } from '../../src/lib/calendar-days';

describe('todayIn: the business’s calendar day', () => {
  // Offsets from the IANA time zone database: America/Denver is UTC−7 in winter (MST) and UTC−6
  // in summer (MDT); Pacific/Auckland is UTC+13 in its summer (NZDT).
  it('is the day where the business is, not where the device is', () => {
    // 05:00 UTC on 3 December = 22:00 on 2 December in Denver (UTC−7).
    expect(todayIn('America/Denver', new Date('2026-12-03T05:00:00Z'))).toBe('2026-12-02');
    // 05:00 UTC on 1 July = 23:00 on 30 June in Denver (UTC−6).
    expect(todayIn('America/Denver', new Date('2026-07-01T05:00:00Z'))).toBe('2026-06-30');
    // 07:00 UTC on 1 July = 01:00 on 1 July in Denver.
    expect(todayIn('America/Denver', new Date('2026-07-01T07:00:00Z'))).toBe('2026-07-01');
    // 12:00 UTC on 2 December = 01:00 on 3 December in Auckland (UTC+13).
    expect(todayIn('Pacific/Auckland', new Date('2026-12-02T12:00:00Z'))).toBe('2026-12-03');
  });

  it('agrees with @date-fns/tz at every hour across a year', () => {
    for (const zone of [
      'America/Denver',
      'America/St_Johns',
      'Europe/London',
      'Asia/Kolkata',
      'Pacific/Chatham',
    ]) {
      for (let hour = 0; hour < 365 * 24; hour += 13) {
        const instant = new Date(Date.UTC(2026, 0, 1) + hour * 3_600_000);
        expect(todayIn(zone, instant), `${zone} ${instant.toISOString()}`).toBe(
          format(new TZDate(instant.getTime(), zone), 'yyyy-MM-dd'),
        );
      }
    }
  });
});
