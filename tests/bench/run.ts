/**
 * `npm run bench [-- --runs N --slow-runs N --only cli,http,pdf,browser,start,bytes]`: Vanbay's
 * speed against the large seed (`npm run seed:large`), each figure the median of repeated runs
 * beside a floor measured in the same run, interleaved with it:
 *
 * - the built CLI's `--help` and a `calc`, against `node -e 0`;
 * - the week report and a machine's whole history over HTTP (the app in this process on a
 *   loopback port), against the very SQL those requests ran, recorded from them and replayed
 *   straight on PGlite: the week report once as the first requests after a start meet it, then
 *   both as a server in use answers them (after WARM_REQUESTS requests), where targets are read;
 * - invoice PDF rendering (warm), against a one-line PDF in the same font;
 * - the dashboard's initial JS and CSS (gzip -9 bytes), against React alone; first render of
 *   the week page in headless Chromium, against a static page;
 * - server start on the existing data dir (first good /api/health), against a bare Node
 *   process opening PGlite on it.
 *
 * Targets come from the issue ("Proof"); a miss is reported as a miss. Results go to
 * tests/bench/results/latest.json and latest.md (README-ready).
 */
import { spawn, spawnSync } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import {
  existsSync,
  mkdirSync,
  mkdtempSync,
  readdirSync,
  readFileSync,
  statSync,
  writeFileSync,
} from 'node:fs';
import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { parseArgs } from 'node:util';
import { gzipSync } from 'node:zlib';
import { PGlite } from '@electric-sql/pglite';
import { eq, sql } from 'drizzle-orm';
import { build } from 'esbuild';
import PDFDocument from 'pdfkit';
import type { Request } from 'playwright-core';
import { SESSION_COOKIE } from '../../shared/api/auth';
import { createApp } from '../../server/app';
import { signSession } from '../../server/auth/tokens';
import { CLIENT_DIR, clientBuildIsCurrent, ensureClientBuilt } from '../../server/build-client';
import { PROJECT_ROOT } from '../../server/config';
import { lockDataDir } from '../../server/data-dir-lock';
import { fromPglite, queryRows } from '../../server/db/client';
import { migrate } from '../../server/db/migrate';
import * as t from '../../server/db/schema';
import { FONT_REGULAR, registerFonts } from '../../server/pdf/fonts';
import { renderInvoicePdf } from '../../server/pdf/invoice-pdf';
import { actorFromToken } from '../../server/services/auth';
import { invoiceDocument } from '../../server/services/invoice-documents';
import { launchBrowser } from '../helpers/browser';
import { largeDataDir, pgDirOf, readMeta } from './large-dir';
import { machineInfo, markdown, median, textTable, verdictOf, type Figure } from './report';
import { LARGE_SEED_VERSION } from './seed-large-generator';

const PARTS = ['bytes', 'cli', 'http', 'pdf', 'browser', 'start'] as const;
type Part = (typeof PARTS)[number];

const { values: args } = parseArgs({
  options: {
    runs: { type: 'string', default: process.env.BENCH_RUNS ?? '15' },
    'slow-runs': { type: 'string', default: process.env.BENCH_SLOW_RUNS ?? '5' },
    only: { type: 'string' },
  },
  strict: true,
});
const RUNS = Number(args.runs);
/** Requests to an endpoint before its warm figure is timed (see benchInProcess). */
const WARM_REQUESTS = 50;
const SLOW_RUNS = Number(args['slow-runs']);
for (const [name, n] of [
  ['--runs', RUNS],
  ['--slow-runs', SLOW_RUNS],
] as const) {
  if (!Number.isInteger(n) || n < 1 || n > 1000) badInput(`${name} must be a whole number from 1 to 1000`);
}
const only = new Set((args.only ?? PARTS.join(',')).split(',').map((p) => p.trim()));
for (const part of only)
  if (!PARTS.includes(part as Part)) badInput(`--only takes ${PARTS.join(', ')}, not "${part}"`);
const wants = (part: Part) => only.has(part);

function badInput(message: string): never {
  console.error(message);
  process.exit(2);
}

const dataDir = largeDataDir();
const meta = readMeta(dataDir);
if (!meta && (wants('http') || wants('pdf') || wants('browser') || wants('start'))) {
  console.error(
    `No large seed in ${dataDir}: run \`npm run seed:large\` first (a few minutes), then \`npm run bench\`.`,
  );
  process.exit(1);
}
if (meta && meta.version !== LARGE_SEED_VERSION) {
  console.error(
    `${dataDir} was seeded by an older generator (version ${meta.version}, now ${LARGE_SEED_VERSION}): \`npm run seed:large -- --force\` rebuilds it.`,
  );
  process.exit(1);
}
const machine = machineInfo();
const figures: Figure[] = [];
const log = (line: string) => console.error(line);

/** One run: wall-clock milliseconds, and for work done in this process, the CPU milliseconds too. */
interface Sample {
  wall: number;
  cpu?: number;
}

/** Runs each of `fns` once per round, `rounds` times, in turn: drift in the machine hits all alike. */
async function interleaved(
  rounds: number,
  warmup: number,
  fns: (() => Promise<Sample | number> | Sample | number)[],
) {
  const samples = fns.map(() => [] as Sample[]);
  for (let round = 0; round < warmup + rounds; round += 1) {
    for (const [i, fn] of fns.entries()) {
      const result = await fn();
      if (round >= warmup) samples[i]!.push(typeof result === 'number' ? { wall: result } : result);
    }
  }
  return samples;
}

const cpuMs = () => {
  const usage = process.cpuUsage();
  return (usage.user + usage.system) / 1000;
};

/**
 * Times work done in this process. CPU time is kept beside the wall clock because the machine
 * may be shared: a busy neighbour stretches the wall clock, much less this process's CPU time.
 */
async function timed(fn: () => Promise<unknown> | unknown): Promise<Sample> {
  const cpu = cpuMs();
  const began = performance.now();
  await fn();
  return { wall: performance.now() - began, cpu: cpuMs() - cpu };
}

const round2 = (n: number) => Math.round(n * 100) / 100;
const cpuMedian = (samples: Sample[]) =>
  samples.every((s) => s.cpu !== undefined) ? median(samples.map((s) => s.cpu!)) : undefined;

function figure(
  key: string,
  label: string,
  samples: Sample[],
  floor: { label: string; samples: Sample[] } | null,
  target: Figure['target'],
  note?: string,
): Figure {
  const cpu = cpuMedian(samples);
  const floorCpu = floor ? cpuMedian(floor.samples) : undefined;
  return {
    key,
    label,
    unit: 'ms',
    value: median(samples.map((s) => s.wall)),
    runs: samples.length,
    samples: samples.map((s) => round2(s.wall)),
    ...(cpu === undefined ? {} : { cpu }),
    floor: floor
      ? {
          label: floor.label,
          value: median(floor.samples.map((s) => s.wall)),
          samples: floor.samples.map((s) => round2(s.wall)),
          ...(floorCpu === undefined ? {} : { cpu: floorCpu }),
        }
      : null,
    target,
    ...(note ? { note } : {}),
  };
}

// ---------------------------------------------------------------------------------------------
// Builds: the dashboard and the CLI bundle the figures are about

const CLI_BUNDLE = path.join(PROJECT_ROOT, 'cli/dist/vanbay.js');

function newest(entry: string): number {
  if (!existsSync(entry)) return 0;
  const stat = statSync(entry);
  if (!stat.isDirectory()) return stat.mtimeMs;
  return readdirSync(entry).reduce((n, name) => Math.max(n, newest(path.join(entry, name))), stat.mtimeMs);
}

async function ensureBuilds() {
  if (wants('bytes') || wants('browser') || wants('start')) {
    if (await ensureClientBuilt(log)) log('Built the dashboard (it was missing or older than its sources).');
  }
  if (wants('cli')) {
    const cliDir = path.join(PROJECT_ROOT, 'cli');
    const sources = readdirSync(cliDir).filter((name) => name !== 'dist');
    const inputs = Math.max(
      ...sources.map((name) => newest(path.join(cliDir, name))),
      newest(path.join(PROJECT_ROOT, 'shared')),
      newest(path.join(PROJECT_ROOT, 'package-lock.json')),
    );
    if (!existsSync(CLI_BUNDLE) || statSync(CLI_BUNDLE).mtimeMs < inputs) {
      log('Building the CLI bundle (it was missing or older than its sources)…');
      const built = spawnSync(process.execPath, ['--import', 'tsx', 'cli/build.ts'], {
        cwd: PROJECT_ROOT,
        stdio: 'inherit',
      });
      if (built.status !== 0) throw new Error('cli/build.ts failed');
    }
  }
}

// ---------------------------------------------------------------------------------------------
// The dashboard's weight

function initialAssets(): { js: string[]; css: string[] } {
  const html = readFileSync(path.join(CLIENT_DIR, 'index.html'), 'utf8');
  const attr = (tag: string, name: string) => new RegExp(`${name}="([^"]+)"`).exec(tag)?.[1];
  const js: string[] = [];
  const css: string[] = [];
  for (const tag of html.match(/<(script|link)\b[^>]*>/g) ?? []) {
    if (tag.startsWith('<script') && /type="module"/.test(tag) && attr(tag, 'src'))
      js.push(attr(tag, 'src')!);
    if (tag.startsWith('<link') && /rel="modulepreload"/.test(tag)) js.push(attr(tag, 'href')!);
    if (tag.startsWith('<link') && /rel="stylesheet"/.test(tag)) css.push(attr(tag, 'href')!);
  }
  return { js, css };
}

const gzipKb = (bytes: Buffer | Uint8Array) => gzipSync(bytes, { level: 9 }).length / 1024;

async function benchBytes() {
  log('Dashboard: initial JS and CSS…');
  const { js, css } = initialAssets();
  const read = (href: string) => readFileSync(path.join(CLIENT_DIR, href.replace(/^\//, '')));
  const jsKb = js.reduce((sum, href) => sum + gzipKb(read(href)), 0);
  const cssKb = css.reduce((sum, href) => sum + gzipKb(read(href)), 0);
  const rawKb = (hrefs: string[]) => hrefs.reduce((sum, href) => sum + read(href).length / 1024, 0);
  // The floor: React and ReactDOM rendering one element, minified the same way, gzipped alike.
  const react = await build({
    stdin: {
      contents:
        "import { createElement } from 'react'; import { createRoot } from 'react-dom/client';" +
        "createRoot(document.getElementById('root')).render(createElement('p', null, 'Vanbay'));",
      resolveDir: PROJECT_ROOT,
      loader: 'js',
    },
    bundle: true,
    minify: true,
    format: 'esm',
    write: false,
    define: { 'process.env.NODE_ENV': '"production"' },
    logLevel: 'silent',
  });
  const reactKb = gzipKb(react.outputFiles[0]!.contents);
  const size = (
    key: string,
    label: string,
    value: number,
    floor: Figure['floor'],
    target: Figure['target'],
    note: string,
  ): Figure => ({
    key,
    label,
    unit: 'KB',
    value,
    runs: 1,
    samples: [value],
    floor,
    target,
    note,
  });
  figures.push(
    size(
      'dashboard-js',
      'Dashboard initial JS (gzip)',
      jsKb,
      { label: 'React + ReactDOM alone', value: reactKb, samples: [reactKb] },
      { max: 110 },
      `${js.length} file(s) the index.html loads (entry and modulepreloads, not lazy route chunks); ${rawKb(js).toFixed(0)} KB before gzip. gzip level 9.`,
    ),
    size(
      'dashboard-css',
      'Dashboard initial CSS (gzip)',
      cssKb,
      null,
      null,
      `${css.length} file(s), ${rawKb(css).toFixed(0)} KB before gzip.`,
    ),
  );
}

// ---------------------------------------------------------------------------------------------
// CLI start-up

function benchCli() {
  log(`CLI start-up: ${RUNS} runs each…`);
  const home = mkdtempSync(path.join(tmpdir(), 'vanbay-bench-cli-'));
  const env = {
    ...process.env,
    XDG_CONFIG_HOME: home,
    NO_COLOR: '1',
    VANBAY_TOKEN: '',
    VANBAY_URL: 'http://127.0.0.1:9',
  };
  const run = (argv: string[]) => () => {
    const began = performance.now();
    const result = spawnSync(process.execPath, argv, { env, stdio: ['ignore', 'pipe', 'pipe'] });
    const ms = performance.now() - began;
    if (result.status !== 0)
      throw new Error(`node ${argv.join(' ')} exited ${result.status}: ${result.stderr}`);
    return ms;
  };
  return interleaved(RUNS, 2, [
    run(['-e', '0']),
    run([CLI_BUNDLE, '--help']),
    run([CLI_BUNDLE, 'calc', 'convert', '43', 'psi', 'kPa']),
  ]).then(([node, help, calc]) => {
    const floor = { label: 'node -e 0', samples: node! };
    figures.push(
      figure(
        'cli-help',
        'CLI `vanbay --help`',
        help!,
        floor,
        { maxRatio: 2.5 },
        'node cli/dist/vanbay.js, the built single-file bundle.',
      ),
      figure('cli-calc', 'CLI `vanbay calc convert 43 psi kPa`', calc!, floor, null),
    );
  });
}

// ---------------------------------------------------------------------------------------------
// The app in this process, over the large seed

interface Recorded {
  query: string;
  params: unknown[] | undefined;
  options: unknown;
}

async function openLarge() {
  const unlock = lockDataDir(dataDir);
  const client = await PGlite.create({ dataDir: pgDirOf(dataDir) });
  // Every statement the app sends passes here, so a request's SQL can be recorded and replayed.
  const query = client.query.bind(client);
  let recording: Recorded[] | null = null;
  client.query = ((q: string, params?: unknown[], options?: unknown) => {
    recording?.push({ query: q, params, options });
    return query(q, params as never, options as never);
  }) as typeof client.query;
  const database = fromPglite(client);
  await migrate(database);
  return {
    database,
    record: () => (recording = []),
    stopRecording: () => {
      const recorded = recording ?? [];
      recording = null;
      return recorded;
    },
    replay: async (statements: Recorded[]) => {
      for (const s of statements) await query(s.query, s.params as never, s.options as never);
    },
    close: async () => {
      await database.close();
      unlock();
    },
  };
}

/** An HTTP figure: what is asked, and what it is held to. */
interface Endpoint {
  key: string;
  label: string;
  address: string;
  target: Figure['target'];
  what: string;
}

/** Monday of the last whole week before `today` (YYYY-MM-DD), on the calendar of the seed's today. */
function lastWholeWeek(todayIso: string): string {
  const day = new Date(`${todayIso.slice(0, 10)}T00:00:00Z`);
  const back = ((day.getUTCDay() + 6) % 7) + 7;
  return new Date(day.getTime() - back * 86_400_000).toISOString().slice(0, 10);
}

async function benchInProcess() {
  const large = await openLarge();
  const { db } = large.database;
  const secret = new Uint8Array(randomBytes(32));
  const uploadsDir = mkdtempSync(path.join(tmpdir(), 'vanbay-bench-uploads-'));
  const app = createApp({ db, secret, uploadsDir, clientDir: CLIENT_DIR });
  const server = app.listen(0, '127.0.0.1');
  // Longer than any gap between two timed requests, so fetch never reuses a socket being closed.
  server.keepAliveTimeout = 120_000;
  await new Promise((resolve) => server.once('listening', resolve));
  const base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  try {
    const [owner] = await db.select().from(t.users).where(eq(t.users.email, 'owner@ridgeback.test'));
    const { token } = await signSession(secret, owner!, new Date());
    const week = lastWholeWeek(meta!.today);
    const [busiest] = await queryRows<{ machine_id: number; n: number }>(
      db,
      sql`select machine_id, count(*)::int as n from jobs group by machine_id order by n desc, machine_id limit 1`,
    );
    const [jobCount] = await queryRows<{ n: number }>(db, sql`select count(*)::int as n from jobs`);

    if (wants('http')) {
      const get = async (address: string) => {
        const response = await fetch(`${base}${address}`, { headers: { Authorization: `Bearer ${token}` } });
        if (response.status !== 200)
          throw new Error(`GET ${address} answered ${response.status}: ${await response.text()}`);
        return response.json() as Promise<unknown>;
      };
      const endpoints: Endpoint[] = [
        {
          key: 'week-report',
          label: 'Week report over HTTP',
          address: `/api/reports/week?start=${week}`,
          target: { max: 25, maxRatio: 2 },
          what: `week of ${week}`,
        },
        {
          key: 'machine-history',
          label: 'Machine history over HTTP',
          address: `/api/machines/${busiest!.machine_id}/history`,
          target: null,
          what: `machine ${busiest!.machine_id}, ${busiest!.n} jobs, the most of any`,
        },
      ];
      const measure = async ({ key, label, address, target, what }: Endpoint, when: string) => {
        log(`${label} (${what}): ${RUNS} runs each…`);
        large.record();
        await get(address);
        const statements = large.stopRecording();
        const [http, raw] = await interleaved(RUNS, 2, [
          () => timed(() => get(address)),
          () => timed(() => large.replay(statements)),
        ]);
        figures.push(
          figure(
            key,
            label,
            http!,
            { label: `its ${statements.length} SQL statements on PGlite`, samples: raw! },
            target,
            `${what}; ${jobCount!.n} jobs in the database; ${when}. The floor is every statement the request sent (sign-in check included), replayed as sent.`,
          ),
        );
      };
      // First, the week report as the first requests after a start meet it: the server has
      // answered 3 before (PGlite's buffers warm), its code has not been optimised yet.
      const week_ = endpoints[0]!;
      for (let i = 0; i < 3; i += 1) await get(week_.address);
      await measure(
        {
          ...week_,
          key: 'week-report-after-start',
          label: `${week_.label}, first requests after start`,
          target: null,
        },
        'the first requests after the app started (3 before)',
      );
      // Then as a server in use answers it: V8 optimises the request path over the first few dozen
      // requests, and most of that path (PGlite's protocol and result code, drizzle, express) is
      // every route's, so a server the dashboard has used for a few minutes runs it optimised.
      // The targets are read here.
      for (const endpoint of endpoints) {
        for (let i = 0; i < WARM_REQUESTS; i += 1) await get(endpoint.address);
        await measure(endpoint, `after ${WARM_REQUESTS} requests to it, as a server in use`);
      }
    }

    if (wants('pdf')) {
      log(`Invoice PDF: ${RUNS} runs each…`);
      const [invoice] = await queryRows<{ id: number; lines: number; payments: number }>(
        db,
        sql`select i.id, (select count(*)::int from invoice_lines l where l.invoice_id = i.id) as lines,
                   (select count(*)::int from payments p where p.invoice_id = i.id) as payments
            from invoices i where i.status = 'paid' order by lines desc, payments desc, i.id desc limit 1`,
      );
      const actor = await actorFromToken({ db, secret, now: () => new Date() }, token);
      const document = await invoiceDocument(db, actor!, invoice!.id, new Date());
      const onePage = () =>
        new Promise<Buffer>((resolve, reject) => {
          const doc = new PDFDocument({ size: 'LETTER', margin: 48 });
          const chunks: Buffer[] = [];
          doc.on('data', (chunk: Buffer) => chunks.push(chunk));
          doc.on('end', () => resolve(Buffer.concat(chunks)));
          doc.on('error', reject);
          registerFonts(doc);
          doc.font(FONT_REGULAR).fontSize(12).text(`Invoice ${document.invoice.number}`);
          doc.end();
        });
      const [pdf, floor] = await interleaved(RUNS, 3, [
        () => timed(() => renderInvoicePdf(document, 'letter')),
        () => timed(onePage),
      ]);
      figures.push(
        figure(
          'invoice-pdf',
          'Invoice PDF render (warm)',
          pdf!,
          { label: 'one line of text in the same font', samples: floor! },
          { max: 60 },
          `invoice ${invoice!.id}: ${invoice!.lines} lines, ${invoice!.payments} payment(s), Letter; server/pdf/invoice-pdf.ts renderInvoicePdf.`,
        ),
      );
    }

    if (wants('browser')) await benchBrowser(base, token, week);
  } finally {
    await new Promise((resolve) => server.close(resolve));
    await large.close();
  }
}

/**
 * Records when an element first appears: `performance.now()`, milliseconds since navigation
 * began. Written as text, since tsx would wrap a function's inner names in a helper the page
 * does not have.
 */
const markWhenShown = (selector: string) => `(() => {
  const check = () => {
    if (window.__shownAt === undefined && document.querySelector(${JSON.stringify(selector)})) {
      window.__shownAt = performance.now();
    }
  };
  new MutationObserver(check).observe(document, { childList: true, subtree: true });
  document.addEventListener('DOMContentLoaded', check);
})();`;

async function benchBrowser(base: string, token: string, week: string) {
  log(`Week page first render in Chromium: ${SLOW_RUNS} runs each…`);
  const staticPage: Server = createServer((_req, res) => {
    res.writeHead(200, { 'content-type': 'text/html; charset=utf-8' });
    res.end(
      '<!doctype html><html lang="en"><head><meta charset="utf-8"><title>Floor</title></head><body><h1 id="ready">Ready</h1></body></html>',
    );
  }).listen(0, '127.0.0.1');
  await new Promise((resolve) => staticPage.once('listening', resolve));
  const staticUrl = `http://127.0.0.1:${(staticPage.address() as AddressInfo).port}/`;
  const browser = await launchBrowser();
  let scriptKb = 0;
  try {
    // A fresh context each time: an empty HTTP cache, as on a first visit from the phone.
    const visit = async (url: string, selector: string, signedIn: boolean) => {
      const context = await browser.newContext({ viewport: { width: 1280, height: 800 } });
      try {
        if (signedIn) {
          await context.addCookies([
            { name: SESSION_COOKIE, value: token, url: base, httpOnly: true, sameSite: 'Strict' },
          ]);
        }
        await context.addInitScript({ content: markWhenShown(selector) });
        const page = await context.newPage();
        // Bytes as they crossed the wire (gzip-encoded where the server compressed them); a compressed
        // response carries no content-length, so the request's own sizes are asked for.
        const scripts: Request[] = [];
        page.on('response', (response) => {
          if (response.request().resourceType() === 'script') scripts.push(response.request());
        });
        await page.goto(url);
        await page.waitForSelector(selector, { timeout: 60_000 });
        const shownAt = await page.evaluate(
          () => (window as unknown as { __shownAt?: number }).__shownAt ?? NaN,
        );
        if (!Number.isFinite(shownAt)) throw new Error(`${url}: ${selector} was not marked`);
        if (signedIn) {
          const sizes = await Promise.all(scripts.map((request) => request.sizes()));
          scriptKb = sizes.reduce((sum, size) => sum + size.responseBodySize, 0) / 1024;
        }
        return shownAt;
      } finally {
        await context.close();
      }
    };
    const [week_, floor] = await interleaved(SLOW_RUNS, 1, [
      () => visit(`${base}/week?start=${week}`, '#week-figures', true),
      () => visit(staticUrl, '#ready', false),
    ]);
    figures.push(
      figure(
        'week-render',
        'Week page first render (Chromium)',
        week_!,
        { label: 'a static page', samples: floor! },
        null,
        `cold context each run, signed in as the owner by cookie; from navigation start until the week's figures are in the page (/week?start=${week}); ${scriptKb.toFixed(0)} KB of JavaScript fetched for it, as sent (gzip).`,
      ),
    );
  } finally {
    await browser.close();
    await new Promise((resolve) => staticPage.close(resolve));
  }
}

// ---------------------------------------------------------------------------------------------
// Server start on the existing data dir

interface Spawned {
  ms: number;
  output: string;
}

/** Spawns a process and times it until `ready` resolves; then stops it and waits for its exit. */
function spawnUntil(
  argv: string[],
  env: NodeJS.ProcessEnv,
  ready: (output: string) => Promise<boolean> | boolean,
): Promise<Spawned> {
  return new Promise<Spawned>((resolve, reject) => {
    const began = performance.now();
    const child = spawn(process.execPath, argv, {
      cwd: PROJECT_ROOT,
      env,
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    let output = '';
    let done = false;
    let ms = 0;
    const exited = new Promise<void>((resolveExit) => child.once('exit', () => resolveExit()));
    const stop = async () => {
      if (child.exitCode === null) child.kill('SIGTERM');
      const killer = setTimeout(() => child.kill('SIGKILL'), 20_000);
      await exited;
      clearTimeout(killer);
    };
    const poll = async () => {
      while (!done && child.exitCode === null) {
        if (await ready(output)) {
          ms = performance.now() - began;
          done = true;
          await stop();
          resolve({ ms, output });
          return;
        }
        await new Promise((r) => setTimeout(r, 2));
      }
      if (!done)
        reject(new Error(`node ${argv.join(' ')} exited ${child.exitCode} before it was ready:\n${output}`));
    };
    child.stdout.on('data', (chunk: Buffer) => (output += chunk));
    child.stderr.on('data', (chunk: Buffer) => (output += chunk));
    child.once('error', reject);
    void poll();
  });
}

async function benchStart() {
  log(`Server start on ${dataDir}: ${SLOW_RUNS} runs each…`);
  const env = { ...process.env };
  for (const name of ['DATABASE_URL', 'SMTP_URL', 'VANBAY_SECRET', 'VANBAY_SEED', 'PORT']) delete env[name];
  Object.assign(env, { HOST: '127.0.0.1', PORT: '0', VANBAY_DATA_DIR: dataDir, VANBAY_REQUEST_LOG: 'off' });
  let rebuilt = 0;
  const server = async () => {
    if (!clientBuildIsCurrent()) await ensureClientBuilt(log); // never time a dashboard build
    const started = await spawnUntil(['--import', 'tsx', 'server/index.ts'], env, async (output) => {
      const port = /running at http:\/\/localhost:(\d+)/.exec(output)?.[1];
      if (!port) return false;
      const response = await fetch(`http://127.0.0.1:${port}/api/health`).catch(() => null);
      return response?.status === 200;
    });
    if (/Building the dashboard/.test(started.output)) rebuilt += 1;
    return started.ms;
  };
  const floor = async () =>
    (
      await spawnUntil(
        [path.join(PROJECT_ROOT, 'tests/bench/open-pglite.mjs'), pgDirOf(dataDir)],
        env,
        (output) => output.includes('open'),
      )
    ).ms;
  const [start, open] = await interleaved(SLOW_RUNS, 1, [server, floor]);
  figures.push(
    figure(
      'server-start',
      'Server start, existing data dir',
      start!,
      { label: 'Node opening PGlite alone', samples: open! },
      null,
      `node --import tsx server/index.ts (there is no built server) until the first 200 from /api/health: migrations checked, demo seed skipped, fake SMTP, listen.${rebuilt ? ` ${rebuilt} run(s) rebuilt the dashboard: discard those.` : ''}`,
    ),
  );
}

// ---------------------------------------------------------------------------------------------

await ensureBuilds();
if (wants('bytes')) await benchBytes();
if (wants('cli')) await benchCli();
if (wants('http') || wants('pdf') || wants('browser')) await benchInProcess();
if (wants('start')) await benchStart();

const order = [
  'cli-help',
  'cli-calc',
  'week-report',
  'week-report-after-start',
  'machine-history',
  'server-start',
  'invoice-pdf',
  'dashboard-js',
  'dashboard-css',
  'week-render',
];
figures.sort((a, b) => order.indexOf(a.key) - order.indexOf(b.key));
const scale = meta
  ? `the large seed (scale ${meta.scale}: ${meta.counts.jobs} jobs, ${meta.counts.readings} readings, ${meta.counts.trips} trips, ${meta.counts.invoices} invoices)`
  : 'no large seed';
console.log(textTable(figures));
const md = markdown(figures, machine, scale);
console.log(`\n${md}`);
const resultsDir = path.join(PROJECT_ROOT, 'tests/bench/results');
mkdirSync(resultsDir, { recursive: true });
// latest.* is the whole bench, as README quotes it; a run of some parts writes beside it instead of
// replacing the whole with a few figures.
const stem = args.only ? `only-${[...only].sort().join('-')}` : 'latest';
writeFileSync(
  path.join(resultsDir, `${stem}.json`),
  `${JSON.stringify({ machine, seed: meta, runs: RUNS, slowRuns: SLOW_RUNS, figures: figures.map((f) => ({ ...f, result: verdictOf(f) })) }, null, 2)}\n`,
);
writeFileSync(path.join(resultsDir, `${stem}.md`), `${md}\n`);
console.error(`Written: tests/bench/results/${stem}.json and ${stem}.md`);
const missed = figures.filter((f) => verdictOf(f) === 'miss');
console.error(missed.length ? `\nMissed: ${missed.map((f) => f.label).join('; ')}` : '\nNo target missed.');
