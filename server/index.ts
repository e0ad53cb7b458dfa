/**
 * The listening process: opens (or creates) the database, applies migrations, seeds the demo on
 * first run, serves the API and the built dashboard, and closes the database on SIGINT/SIGTERM.
 */
import type { Server } from 'node:http';
import path from 'node:path';
import type { AddressInfo } from 'node:net';
import { pathToFileURL } from 'node:url';
import { PAYMENT_WEBHOOK_PATH } from '../shared/api/payments';
import { createApp } from './app';
import { loadSessionSecret } from './auth/secret';
import { CLIENT_DIR, ensureClientBuilt } from './build-client';
import { readConfig, type ServerConfig } from './config';
import { lockDataDir } from './data-dir-lock';
import { databaseOptions, openDatabase, type Database } from './db/client';
import { migrate } from './db/migrate';
import { seedDemo } from './db/seed';
import { DEMO_PASSWORD, demoUsers } from './db/seed-data';
import { startFakeSmtp, type FakeSmtp } from './mail/fake-smtp';
import { createMailer, type Mailer } from './mail/mailer';
import { startFakePaymentServer, type FakePaymentServer } from './payments/fake-payment-server';
import type { PaymentProvider } from './payments/provider';
import { createStripeProvider } from './payments/stripe-provider';
import { startMailRetries } from './services/mail';

export interface RunningServer {
  url: string;
  server: Server;
  database: Database;
  /** Where mail goes: SMTP_URL's server, or the local fake (`fake` set) when SMTP_URL is unset. */
  mailer: Mailer;
  fake: FakeSmtp | null;
  /** Card payments: STRIPE_SECRET_KEY's account, or the local fake (`paymentsFake`) when it is unset. */
  payments: PaymentProvider;
  paymentsFake: FakePaymentServer | null;
  stop(): Promise<void>;
}

export interface StartOptions {
  config?: ServerConfig;
  /** Serve the built dashboard (building it first when stale); off for `npm run dev`. */
  serveClient?: boolean;
  log?: (line: string) => void;
}

export async function startServer({
  config = readConfig(),
  serveClient = true,
  log = (line) => console.log(line),
}: StartOptions = {}): Promise<RunningServer> {
  const unlock = config.databaseUrl ? () => {} : lockDataDir(config.dataDir);
  // The dashboard build and the database start-up are independent: run them side by side.
  const [opened, built] = await Promise.allSettled([
    openAndPrepare(config, log),
    serveClient ? ensureClientBuilt(log) : Promise.resolve(false),
  ]);
  if (opened.status === 'rejected' || built.status === 'rejected') {
    if (opened.status === 'fulfilled') await opened.value.close();
    unlock();
    throw opened.status === 'rejected' ? opened.reason : (built as PromiseRejectedResult).reason;
  }
  const database = opened.value;
  // Without SMTP_URL, mail goes to a local fake so nothing reaches a real inbox by accident.
  const smtpUrl = process.env.SMTP_URL?.trim();
  let fake: FakeSmtp | null = null;
  // Without STRIPE_SECRET_KEY, card links go to a local fake: no real card is ever charged.
  const stripeKey = process.env.STRIPE_SECRET_KEY?.trim();
  let paymentsFake: FakePaymentServer | null = null;
  let payments: PaymentProvider;
  // The customer's way back after paying; set once the server listens unless VANBAY_PUBLIC_URL says.
  let publicUrl = process.env.VANBAY_PUBLIC_URL?.trim().replace(/\/+$/, '') ?? '';
  try {
    fake = smtpUrl ? null : await startFakeSmtp();
    paymentsFake = stripeKey ? null : await startFakePaymentServer();
    payments = createStripeProvider({
      ...stripeSettings(stripeKey, paymentsFake),
      successUrl: (invoiceId) => `${publicUrl}/invoices/${invoiceId}`,
    });
  } catch (error) {
    await fake?.close();
    await paymentsFake?.close();
    await database.close();
    unlock();
    throw error;
  }
  const mailer = createMailer(smtpUrl ? { smtpUrl } : { host: fake!.host, port: fake!.port });
  log(
    fake
      ? `Mail: local test SMTP on 127.0.0.1:${fake.port} (nothing leaves this machine; set SMTP_URL to send).`
      : `Mail: SMTP via ${mailer.target}`,
  );
  log(
    paymentsFake
      ? `Card payments: local test service on ${paymentsFake.url} (no real money; set STRIPE_SECRET_KEY to take cards).`
      : `Card payments: ${payments.target}`,
  );
  let server: Server;
  const app = createApp({
    mailer,
    payments,
    db: database.db,
    secret: loadSessionSecret(config.dataDir),
    uploadsDir: path.join(config.dataDir, 'uploads'),
    ...(serveClient ? { clientDir: CLIENT_DIR } : {}),
    ...(process.env.VANBAY_REQUEST_LOG === 'off' ? {} : { log }),
  });
  try {
    server = await listen(app, config);
  } catch (error) {
    mailer.close();
    await fake?.close();
    await paymentsFake?.close();
    await database.close();
    unlock();
    throw error;
  }
  const { port } = server.address() as AddressInfo;
  const url = `http://localhost:${port}`;
  publicUrl ||= url;
  // The fake calls back over loopback; a wildcard listen address is reached at 127.0.0.1.
  const wildcard = ['0.0.0.0', '::', ''].includes(config.host);
  const callbackHost = wildcard ? '127.0.0.1' : config.host.includes(':') ? `[${config.host}]` : config.host;
  if (paymentsFake) paymentsFake.webhookUrl = `http://${callbackHost}:${port}${PAYMENT_WEBHOOK_PATH}`;
  // Failed mail is tried again on its backoff for as long as the server runs: never lost.
  const stopRetries = startMailRetries(database.db, mailer, () => new Date());

  let stopping: Promise<void> | undefined;
  const stop = () =>
    (stopping ??= (async () => {
      await new Promise<void>((resolve) => {
        server.close(() => resolve());
        server.closeIdleConnections();
        // Requests still running after a few seconds are cut so the database can close.
        setTimeout(() => server.closeAllConnections(), 3_000).unref();
      });
      stopRetries();
      mailer.close();
      await fake?.close();
      await paymentsFake?.close();
      await database.close();
      unlock();
    })());
  return { url, server, database, mailer, fake, payments, paymentsFake, stop };
}

/** STRIPE_SECRET_KEY's account (its webhook secret is then required), or the local fake. */
function stripeSettings(secretKey: string | undefined, fake: FakePaymentServer | null) {
  if (fake) return { secretKey: fake.apiKey, webhookSecret: fake.webhookSecret, apiBase: fake.url };
  const webhookSecret = process.env.STRIPE_WEBHOOK_SECRET?.trim();
  if (!webhookSecret) {
    throw new Error(
      'STRIPE_WEBHOOK_SECRET must be set with STRIPE_SECRET_KEY: without it no payment can be confirmed.',
    );
  }
  const apiBase = process.env.STRIPE_API_BASE?.trim();
  return { secretKey: secretKey!, webhookSecret, ...(apiBase ? { apiBase } : {}) };
}

function listen(app: ReturnType<typeof createApp>, config: ServerConfig): Promise<Server> {
  return new Promise<Server>((resolve, reject) => {
    const listening = app.listen(config.port, config.host, (error?: Error) => {
      if (!error) return resolve(listening);
      const code = (error as NodeJS.ErrnoException).code;
      reject(
        code === 'EADDRINUSE'
          ? new Error(
              `Port ${config.port} is already in use: is Vanbay already running? Set PORT to use another.`,
            )
          : error,
      );
    });
  });
}

async function openAndPrepare(config: ServerConfig, log: (line: string) => void): Promise<Database> {
  const database = await openDatabase(databaseOptions(config));
  try {
    await migrate(database);
    if (config.seed === 'demo') {
      const { seeded } = await seedDemo(database.db, { today: new Date() });
      if (seeded) log('Seeded the demo business (Ridgeback Mobile Moto).');
    }
    return database;
  } catch (error) {
    await database.close();
    throw error;
  }
}

function printWelcome(url: string, config: ServerConfig, engine: string) {
  const where = engine === 'pglite' ? `PGlite in ${config.dataDir}` : 'PostgreSQL (DATABASE_URL)';
  console.log(`\nVanbay is running at ${url}  (data: ${where})`);
  if (config.seed === 'demo') {
    console.log(`Demo sign-ins (password for all: ${DEMO_PASSWORD}):`);
    for (const user of demoUsers) console.log(`  ${user.role.padEnd(11)} ${user.email}`);
  }
  console.log('Press Ctrl-C to stop.\n');
}

async function main() {
  // What we print to can go before we do: `npm start | tee server.log`, then Ctrl-C stops tee as
  // well. A write to that closed pipe (EPIPE) would otherwise throw and end the process before the
  // database is closed and the data dir unlocked; with no reader left there is nothing to tell.
  for (const stream of [process.stdout, process.stderr]) stream.on('error', () => {});
  const config = readConfig();
  const running = await startServer({ config });
  // Listening for the signals before saying where we run: whoever waits for that line (a script,
  // the tests) may stop us the moment it appears.
  const shutdown = (signal: string) => {
    console.log(`\n${signal}: closing the database and stopping.`);
    running.stop().then(
      () => process.exit(0),
      (error: unknown) => {
        console.error(error);
        process.exit(1);
      },
    );
  };
  process.once('SIGINT', () => shutdown('SIGINT'));
  process.once('SIGTERM', () => shutdown('SIGTERM'));
  printWelcome(running.url, config, running.database.engine);
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  main().catch((error: unknown) => {
    console.error(error instanceof Error ? error.message : error);
    process.exit(1);
  });
}
