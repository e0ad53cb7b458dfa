import { randomBytes } from 'node:crypto';
import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { createApp } from '../../server/app';
import type { Database } from '../../server/db/client';
import { signSession } from '../../server/auth/tokens';
import * as t from '../../server/db/schema';
import { demoUsers } from '../../server/db/seed-data';
import { startFakeSmtp, type FakeSmtp } from '../../server/mail/fake-smtp';
import { createMailer, type Mailer } from '../../server/mail/mailer';
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
  /** The local SMTP fake the app mails to; null (or absent, for hand-built apps) when it has none. */
  mail?: FakeSmtp | null;
  close(): Promise<void>;
}

export interface SeededApiOptions {
  /**
   * Where the app's mail goes: left out, a fresh fake SMTP server for this API (`mail`); a Mailer
   * of the test's own (a dead port, say); or null for an app with mail not set up (503).
   */
  mailer?: Mailer | null;
}

/** A seeded app on a private database clone, with every demo role signed in once. */
export async function seededApi(options: SeededApiOptions = {}): Promise<TestApi> {
  const database = await cloneDatabase('seeded');
  const clock = {
    now: new Date(SEED_TODAY),
    set(date: Date) {
      this.now = date;
    },
  };
  const secret = new Uint8Array(randomBytes(32));
  const mail = options.mailer === undefined ? await startFakeSmtp() : null;
  const mailer = mail ? createMailer({ host: mail.host, port: mail.port }) : options.mailer;
  const app = createApp({
    db: database.db,
    clock: () => clock.now,
    uploadsDir: tempUploadsDir(),
    secret,
    ...(mailer ? { mailer } : {}),
  });
  // Tokens signed directly, as a sign-in would sign them: the password check costs a scrypt per
  // role per file, and tests/server/auth.test.ts proves the sign-in itself.
  const tokens = {} as Record<Role, string>;
  const users = await database.db.select().from(t.users);
  for (const user of demoUsers) {
    const row = users.find((u) => u.email === user.email)!;
    tokens[user.role] = (await signSession(secret, row, clock.now)).token;
  }
  const close = async () => {
    if (mail) mailer!.close();
    await mail?.close();
    await database.close();
  };
  return { database, app, tokens, clock, mail, close };
}

/** Headers for a caller: a Bearer token, or none for the signed-out caller. */
export function as(api: TestApi, caller: Caller): Record<string, string> {
  return caller === 'anonymous' ? {} : { Authorization: `Bearer ${api.tokens[caller]}` };
}

/** A seeded app listening on a loopback port, for tests that talk to it over real HTTP (the CLI). */
export async function listeningApi(options: SeededApiOptions = {}): Promise<TestApi & { url: string }> {
  const api = await seededApi(options);
  const server: Server = api.app.listen(0, '127.0.0.1');
  await new Promise((resolve) => server.once('listening', resolve));
  const url = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  return {
    ...api,
    url,
    close: async () => {
      await new Promise((resolve) => server.close(resolve));
      await api.close();
    },
  };
}
