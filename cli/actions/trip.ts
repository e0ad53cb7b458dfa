/**
 * `vanbay trip …`: the van's mileage log, kept at the time of the trip as IRS Publication 463
 * asks. A trip started offline is remembered here and sent whole when it ends; every write
 * carries a client id so a replay lands once.
 */
import { existsSync, mkdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import type { Command } from 'commander';
import { format } from 'date-fns';
import { z } from 'zod';
import { TripListSchema, TripSchema, TRIPS_PATH, tripPath, type Trip } from '../../shared/api/trips';
import { createApi, UnreachableError, type Api } from '../lib/api';
import { UsageError, type CliDeps } from '../lib/deps';
import { enqueue, newClientId } from '../lib/queue';
import { configDir } from '../lib/session-store';
import { theme } from '../ui/theme';

const GlobalSchema = z.object({ json: z.boolean().optional(), server: z.string().optional() });

const OpenTripSchema = z.object({
  clientId: z.uuid(),
  server: z.string(),
  /** The server's id once it has the trip; null while it was started offline. */
  id: z.number().nullable(),
  body: z.record(z.string(), z.unknown()),
});
type OpenTrip = z.infer<typeof OpenTripSchema>;

const openTripFile = (env: NodeJS.ProcessEnv) => path.join(configDir(env), 'open-trip.json');

function readOpenTrip(env: NodeJS.ProcessEnv): OpenTrip | null {
  const file = openTripFile(env);
  if (!existsSync(file)) return null;
  const parsed = OpenTripSchema.safeParse(JSON.parse(readFileSync(file, 'utf8')));
  return parsed.success ? parsed.data : null;
}

function writeOpenTrip(env: NodeJS.ProcessEnv, trip: OpenTrip) {
  mkdirSync(configDir(env), { recursive: true, mode: 0o700 });
  writeFileSync(openTripFile(env), JSON.stringify(trip), { mode: 0o600 });
}

function odometer(text: string | undefined, flag: string): number {
  if (text === undefined) throw new UsageError(`give ${flag} (the van's odometer)`);
  if (!/^\d+(\.\d{1,3})?$/.test(text))
    throw new UsageError(`${flag} must be an odometer reading like 48213.4, got "${text}"`);
  return Number(text);
}

/** Sends a write, or queues it when the server is out of reach; says which. */
async function sendOrQueue(
  deps: CliDeps,
  api: Api,
  method: 'POST' | 'PATCH',
  where: string,
  body: Record<string, unknown>,
  clientId: string,
  summary: string,
) {
  try {
    // Only a create carries the client id; ending a trip is idempotent by itself.
    const sent = method === 'POST' ? { ...body, clientId } : body;
    return { trip: await api.request(method, where, TripSchema, { body: sent }), queued: false };
  } catch (error) {
    if (!(error instanceof UnreachableError)) throw error;
    enqueue(deps.env, { clientId, server: api.server, method, path: where, body, summary });
    deps.stderr.write(`${theme.warn('server unreachable')}: ${summary} queued; \`vanbay sync\` sends it\n`);
    return { trip: null, queued: true };
  }
}

const StartSchema = GlobalSchema.extend({
  odometer: z.string().optional(),
  to: z.string().min(1).max(200),
  purpose: z.string().min(1).max(500),
  from: z.string().max(200).optional(),
  job: z.string().regex(/^\d+$/, 'give the job number').optional(),
  km: z.boolean().optional(),
});

export async function runTripStart(deps: CliDeps, options: z.infer<typeof StartSchema>, now = new Date()) {
  if (readOpenTrip(deps.env))
    throw new UsageError('a trip is already under way: `vanbay trip end --odometer N` first');
  const api = createApi(deps, options.server);
  const body = {
    startOdometer: odometer(options.odometer, '--odometer'),
    destination: options.to,
    purpose: options.purpose,
    tripDate: format(now, 'yyyy-MM-dd'),
    startedAt: now.toISOString(),
    ...(options.from ? { origin: options.from } : {}),
    ...(options.job ? { jobId: Number(options.job) } : {}),
    ...(options.km ? { odometerUnit: 'km' } : {}),
  };
  const clientId = newClientId();
  // Started offline, the trip is kept here only and sent whole when it ends.
  let trip: Trip | null = null;
  try {
    trip = await api.request('POST', TRIPS_PATH, TripSchema, { body: { ...body, clientId } });
  } catch (error) {
    if (!(error instanceof UnreachableError)) throw error;
    deps.stderr.write(`${theme.warn('server unreachable')}: trip kept on this machine until it ends\n`);
  }
  writeOpenTrip(deps.env, { clientId, server: api.server, id: trip?.id ?? null, body });
  return { trip, clientId, body };
}

export async function runTripEnd(
  deps: CliDeps,
  options: z.infer<typeof GlobalSchema> & { odometer?: string },
  now = new Date(),
) {
  const open = readOpenTrip(deps.env);
  if (!open)
    throw new UsageError('no trip under way: `vanbay trip start` first, or `vanbay trip add` after the fact');
  const end = odometer(options.odometer, '--odometer');
  const start = open.body.startOdometer as number;
  if (end < start) throw new UsageError(`the odometer reads ${end}, below the ${start} the trip started at`);
  const api = createApi(deps, options.server ?? open.server);
  const summary = `trip to ${String(open.body.destination)}`;
  const result =
    open.id !== null
      ? await sendOrQueue(
          deps,
          api,
          'PATCH',
          tripPath(open.id),
          { endOdometer: end, endedAt: now.toISOString() },
          newClientId(),
          summary,
        )
      : await sendOrQueue(
          deps,
          api,
          'POST',
          TRIPS_PATH,
          { ...open.body, endOdometer: end, endedAt: now.toISOString() },
          open.clientId,
          summary,
        );
  rmSync(openTripFile(deps.env), { force: true });
  return { ...result, distance: Math.round((end - start) * 1000) / 1000 };
}

const AddSchema = StartSchema.extend({
  start: z.string().optional(),
  end: z.string().optional(),
  date: z.string().optional(),
});

function print(deps: CliDeps, options: { json?: boolean }, value: unknown, line: string) {
  deps.stdout.write(options.json ? `${JSON.stringify(value)}\n` : `${line}\n`);
}

export async function tripStartAction(deps: CliDeps, raw: unknown, command: Command) {
  const options = StartSchema.parse({ ...command.optsWithGlobals(), ...(raw as object) });
  const result = await runTripStart(deps, options);
  print(
    deps,
    options,
    { started: true, id: result.trip?.id ?? null, clientId: result.clientId },
    `trip started at ${String(result.body.startOdometer)}`,
  );
}

export async function tripEndAction(deps: CliDeps, raw: { odometer?: string }, command: Command) {
  const options = GlobalSchema.parse({ ...command.optsWithGlobals(), ...(raw as object) });
  const result = await runTripEnd(deps, { ...options, odometer: raw.odometer });
  print(
    deps,
    options,
    { ...(result.trip ?? {}), queued: result.queued },
    result.trip
      ? `trip ${result.trip.id}: ${result.trip.miles ?? result.distance} mi`
      : `trip ended: ${result.distance} on the odometer`,
  );
}

export async function tripAddAction(deps: CliDeps, raw: unknown, command: Command) {
  const options = AddSchema.parse({ ...command.optsWithGlobals(), ...(raw as object) });
  const startAt = odometer(options.start, '--start');
  const endAt = odometer(options.end, '--end');
  if (endAt < startAt) throw new UsageError('--end must be at least --start');
  if (options.date && !/^\d{4}-\d{2}-\d{2}$/.test(options.date))
    throw new UsageError('--date must be YYYY-MM-DD');
  const api = createApi(deps, options.server);
  const body = {
    startOdometer: startAt,
    endOdometer: endAt,
    destination: options.to,
    purpose: options.purpose,
    tripDate: options.date ?? format(new Date(), 'yyyy-MM-dd'),
    ...(options.from ? { origin: options.from } : {}),
    ...(options.job ? { jobId: Number(options.job) } : {}),
    ...(options.km ? { odometerUnit: 'km' } : {}),
  };
  const result = await sendOrQueue(
    deps,
    api,
    'POST',
    TRIPS_PATH,
    body,
    newClientId(),
    `trip to ${options.to}`,
  );
  print(
    deps,
    options,
    { ...(result.trip ?? {}), queued: result.queued },
    result.trip ? `trip ${result.trip.id}: ${result.trip.miles} mi` : 'trip queued',
  );
}

export async function tripListAction(deps: CliDeps, raw: { from?: string; to?: string }, command: Command) {
  const options = GlobalSchema.parse({ ...command.optsWithGlobals(), ...(raw as object) });
  const page = await createApi(deps, options.server).request('GET', TRIPS_PATH, TripListSchema, {
    query: { from: raw.from, to: raw.to, limit: 100 },
  });
  if (options.json) {
    deps.stdout.write(`${JSON.stringify(page.items)}\n`);
    return;
  }
  for (const t of page.items) {
    deps.stdout.write(
      `${t.tripDate}  ${String(t.miles ?? '…').padStart(8)} mi  ${t.destination} — ${t.purpose}\n`,
    );
  }
}
