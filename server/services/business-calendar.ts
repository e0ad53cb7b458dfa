/**
 * The business's calendar: "today", due dates and what is overdue are days where the mechanic
 * works (the business's time zone), never UTC's or the server's.
 */
import { TZDate } from '@date-fns/tz';
import { eq } from 'drizzle-orm';
import { formatISO } from 'date-fns';
import type { Db } from '../db/client';
import * as t from '../db/schema';
import { found } from './scope';

type Reader = Pick<Db, 'select'>;

/** The calendar day an instant falls on in a time zone, YYYY-MM-DD. */
export function dayIn(timezone: string, instant: Date): string {
  return formatISO(new TZDate(instant.getTime(), timezone), { representation: 'date' });
}

export async function businessTimezone(db: Reader, businessId: number): Promise<string> {
  const [row] = await db
    .select({ timezone: t.businesses.timezone })
    .from(t.businesses)
    .where(eq(t.businesses.id, businessId));
  return found(row, 'business').timezone;
}

/** The business's today, which decides what is due and what is overdue. */
export async function businessToday(db: Reader, businessId: number, now: Date): Promise<string> {
  return dayIn(await businessTimezone(db, businessId), now);
}
