import { sql } from 'drizzle-orm';
import { queryRows } from '../../../server/db/client';
import type { TestApi } from '../../helpers/api';
import type { Fixtures } from './types';

/** Finds the seeded records the access rows point at. */
export async function loadFixtures(api: TestApi): Promise<Fixtures> {
  const one = async (query: ReturnType<typeof sql>) => {
    const rows = await queryRows<{ id: number }>(api.database.db, query);
    if (!rows[0]) throw new Error('seed is missing a fixture the access matrix needs');
    return rows[0].id;
  };
  const ownCustomerId = await one(sql`select id from customers where email = 'jules@example.test'`);
  const otherCustomerId = await one(sql`select id from customers where email = 'rowan@example.test'`);
  return {
    api,
    ownCustomerId,
    otherCustomerId,
    ownMachineId: await one(
      sql`select id from machines where customer_id = ${ownCustomerId} order by id limit 1`,
    ),
    otherMachineId: await one(
      sql`select id from machines where customer_id = ${otherCustomerId} order by id limit 1`,
    ),
    ownJobId: await one(sql`select id from jobs where customer_id = ${ownCustomerId} order by id limit 1`),
    otherJobId: await one(
      sql`select id from jobs where customer_id = ${otherCustomerId} order by id limit 1`,
    ),
    helperUserId: await one(sql`select id from users where role = 'helper'`),
  };
}
