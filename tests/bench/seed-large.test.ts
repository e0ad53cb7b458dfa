/**
 * The large seed on a small scale: the same `today` and scale give the same rows (so a bench on
 * one machine compares with a bench on another), and the history keeps the rules the real data
 * keeps. No timings here: speed belongs in `npm run bench`.
 */
import { sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { CANONICAL_UNITS } from '../../shared/api/readings';
import { queryRows, type Database } from '../../server/db/client';
import { cloneDatabase } from '../helpers/db';
import { SEED_TODAY } from '../helpers/fixtures';
import { seedLarge, tableChecksums } from './seed-large-generator';

/** About a hundred jobs: enough for every story, payment and van change to turn up. */
const SCALE = 0.004;

describe('the large seed', () => {
  let first: Database;
  let firstSums: Record<string, string>;
  beforeAll(async () => {
    // The seeded template holds the demo for SEED_TODAY, which seedLarge finds and builds on.
    first = await cloneDatabase('seeded');
    await seedLarge(first.db, { today: SEED_TODAY, scale: SCALE });
    firstSums = await tableChecksums(first.db);
  });
  afterAll(async () => {
    await first?.close();
  });

  it('writes the same rows, ids and timestamps included, when run again', async () => {
    const second = await cloneDatabase('seeded');
    try {
      await seedLarge(second.db, { today: SEED_TODAY, scale: SCALE });
      expect(await tableChecksums(second.db)).toEqual(firstSums);
    } finally {
      await second.close();
    }
  });

  it('adds years of history to the demo, and refuses to add it twice', async () => {
    const [span] = await queryRows<{ jobs: number; first: string; last: string }>(
      first.db,
      sql`select count(*)::int as jobs, min(scheduled_at)::date::text as first, max(scheduled_at)::date::text as last from jobs`,
    );
    expect(span!.jobs).toBeGreaterThan(100);
    // Ten years back from 2026-11-18, less the few customers of a small scale arriving over time.
    expect(span!.first < '2019-11-18').toBe(true);
    expect(span!.last >= '2026-11-18').toBe(true);
    await expect(seedLarge(first.db, { today: SEED_TODAY, scale: SCALE })).rejects.toThrow(/already holds/);
  });

  it('numbers invoices 1…N without gaps, in the order they were issued', async () => {
    const rows = await queryRows<{ number: number; issued_on: string }>(
      first.db,
      sql`select number, issued_on::text from invoices order by number`,
    );
    expect(rows.map((r) => r.number)).toEqual(rows.map((_, i) => i + 1));
    const days = rows.map((r) => r.issued_on);
    expect(days).toEqual([...days].sort());
    const [counter] = await queryRows<{ last_number: number }>(
      first.db,
      sql`select last_number from invoice_counters`,
    );
    expect(counter!.last_number).toBe(rows.length);
  });

  it('keeps every invoice balance equal to its total less the payments on it', async () => {
    const wrong = await queryRows<{ id: number }>(
      first.db,
      sql`select i.id from invoices i left join payments p on p.invoice_id = i.id
       group by i.id having i.paid_cents <> coalesce(sum(p.amount_cents), 0)
          or i.balance_cents <> i.total_cents - i.paid_cents
          or (i.status = 'paid') <> (i.balance_cents = 0 and i.status <> 'void')`,
    );
    expect(wrong).toEqual([]);
  });

  it('stores every reading in the canonical unit of its quantity (shared/api/readings.ts)', async () => {
    const units = await queryRows<{ quantity: keyof typeof CANONICAL_UNITS; unit: string }>(
      first.db,
      sql`select distinct quantity::text, unit from readings`,
    );
    expect(units.length).toBeGreaterThan(3);
    for (const { quantity, unit } of units) expect(unit).toBe(CANONICAL_UNITS[quantity]);
  });

  it('logs the van in one unbroken odometer per van, ending where the demo’s trips begin', async () => {
    const trips = await queryRows<{ start_odometer: number; end_odometer: number }>(
      first.db,
      sql`select start_odometer, end_odometer from trips order by started_at, id`,
    );
    let vans = 1;
    for (let i = 1; i < trips.length; i += 1) {
      const gap = Math.round((trips[i]!.start_odometer - trips[i - 1]!.end_odometer) * 10);
      if (gap !== 0) vans += 1;
      expect(trips[i]!.end_odometer).toBeGreaterThanOrEqual(trips[i]!.start_odometer);
    }
    // The demo seed's first trip starts at 48,210.4 mi (server/db/seed.ts); history hands over to it.
    expect(vans).toBeLessThanOrEqual(3);
    expect(trips.some((trip) => trip.start_odometer === 48_210.4)).toBe(true);
  });
});
