import request from 'supertest';
import { createApp } from '../../server/app';
import type { Database } from '../../server/db/client';
import { DEMO_PASSWORD, demoUsers } from '../../server/db/seed-data';
import type { Role } from '../../shared/api/users';
import { cloneDatabase, tempUploadsDir } from './db';
import { SEED_TODAY } from './fixtures';

export type Caller = Role | 'anonymous';

export interface TestApi {
  database: Database;
  app: ReturnType<typeof createApp>;
  /** Bearer tokens of the seeded demo sign-ins (CONTRACT.md), one per role. */
  tokens: Record<Role, string>;
  /** The clock the app reads; tests move it with `clock.set`. */
  clock: { now: Date; set(date: Date): void };
  close(): Promise<void>;
}

/** A seeded app on a private database clone, with every demo role signed in once. */
export async function seededApi(): Promise<TestApi> {
  const database = await cloneDatabase('seeded');
  const clock = {
    now: new Date(SEED_TODAY),
    set(date: Date) {
      this.now = date;
    },
  };
  const app = createApp({ db: database.db, clock: () => clock.now, uploadsDir: tempUploadsDir() });
  const tokens = {} as Record<Role, string>;
  for (const user of demoUsers) {
    const response = await request(app)
      .post('/api/auth/sign-in')
      .send({ email: user.email, password: DEMO_PASSWORD })
      .expect(200);
    tokens[user.role] = response.body.token as string;
  }
  return { database, app, tokens, clock, close: () => database.close() };
}

/** Headers for a caller: a Bearer token, or none for the signed-out caller. */
export function as(api: TestApi, caller: Caller): Record<string, string> {
  return caller === 'anonymous' ? {} : { Authorization: `Bearer ${api.tokens[caller]}` };
}
