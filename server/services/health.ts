import { sql } from 'drizzle-orm';
import type { Db } from '../db/client';

/** True when the database answers a trivial query: healthy means the data is reachable. */
export async function checkDatabase(db: Db): Promise<boolean> {
  try {
    await db.execute(sql`select 1`);
    return true;
  } catch {
    return false;
  }
}
