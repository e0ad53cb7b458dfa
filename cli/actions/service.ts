/**
 * `vanbay service`: a machine's service intervals, judged by the server, and recording one done at
 * the roadside. Recorded offline, the change waits in the queue for `vanbay sync` (recording the
 * same day and meter twice changes nothing more).
 */
import type { Command } from 'commander';
import { format } from 'date-fns';
import { z } from 'zod';
import {
  serviceIntervalsPath,
  ServiceIntervalListSchema,
  ServiceIntervalSchema,
  UpdateServiceIntervalInputSchema,
  type ServiceInterval,
} from '../../shared/api/service-intervals';
import { createApi, UnreachableError } from '../lib/api';
import { UsageError, type CliDeps } from '../lib/deps';
import { enqueue, newClientId } from '../lib/queue';
import { theme } from '../ui/theme';

const GlobalSchema = z.object({ json: z.boolean().optional(), server: z.string().optional() });
const DoneSchema = GlobalSchema.extend({ on: z.string().optional(), meter: z.string().optional() });

const idOf = (text: string, what: string) => {
  if (!/^\d+$/.test(text) || Number(text) <= 0)
    throw new UsageError(`${what} must be an id number, got "${text}"`);
  return Number(text);
};

const STATUS_LABEL: Record<ServiceInterval['state']['status'], string> = {
  overdue: 'overdue',
  due: 'due',
  due_soon: 'due soon',
  ok: 'not due',
};

function line(interval: ServiceInterval): string {
  const status = interval.state.status;
  const generic =
    interval.source === 'generic' ? theme.warn('  (generic: confirm in the service manual)') : '';
  return `${String(interval.id).padStart(5)}  ${interval.label.padEnd(24)} ${theme[interval.state.verdict](STATUS_LABEL[status].padEnd(9))} ${interval.state.reason}${generic}\n`;
}

export async function serviceListAction(deps: CliDeps, machineText: string, raw: unknown, command: Command) {
  const options = GlobalSchema.parse({ ...command.optsWithGlobals(), ...(raw as object) });
  const machineId = idOf(machineText, 'MACHINE');
  const api = createApi(deps, options.server);
  const items: ServiceInterval[] = [];
  let cursor: string | null = null;
  do {
    const page: z.infer<typeof ServiceIntervalListSchema> = await api.request(
      'GET',
      serviceIntervalsPath(machineId),
      ServiceIntervalListSchema,
      {
        query: { limit: 100, ...(cursor ? { cursor } : {}) },
      },
    );
    items.push(...page.items);
    cursor = page.nextCursor;
  } while (cursor);
  if (options.json) {
    deps.stdout.write(`${JSON.stringify(items)}\n`);
    return;
  }
  if (items.length === 0) {
    deps.stdout.write(`machine ${machineId} has no service intervals; add them from the dashboard\n`);
    return;
  }
  for (const interval of items) deps.stdout.write(line(interval));
}

export async function serviceDoneAction(
  deps: CliDeps,
  machineText: string,
  intervalText: string,
  raw: unknown,
  command: Command,
) {
  const options = DoneSchema.parse({ ...command.optsWithGlobals(), ...(raw as object) });
  const machineId = idOf(machineText, 'MACHINE');
  const intervalId = idOf(intervalText, 'INTERVAL');
  const on = options.on ?? format(new Date(), 'yyyy-MM-dd');
  const meterText = options.meter?.replace(/,/g, '');
  const body = {
    lastDoneOn: on,
    ...(meterText === undefined
      ? {}
      : { lastDoneMeter: /^\d+(\.\d+)?$/.test(meterText) ? Number(meterText) : NaN }),
  };
  // The API's own schema decides what it would take, so nothing it would refuse is queued.
  const checked = UpdateServiceIntervalInputSchema.safeParse(body);
  if (!checked.success) {
    const bad = checked.error.issues[0]?.path[0] === 'lastDoneMeter' ? 'meter' : 'on';
    throw new UsageError(
      bad === 'meter'
        ? `--meter must be the meter reading, e.g. 18420 or 312.5, got "${options.meter}"`
        : `--on must be a day as YYYY-MM-DD, e.g. 2026-11-18, got "${on}"`,
    );
  }
  const path = `${serviceIntervalsPath(machineId)}/${intervalId}`;
  const api = createApi(deps, options.server);
  try {
    const saved = await api.request('PATCH', path, ServiceIntervalSchema, { body });
    if (options.json) deps.stdout.write(`${JSON.stringify({ queued: false, ...saved })}\n`);
    else
      deps.stdout.write(
        `${saved.label}: done on ${on}; now ${STATUS_LABEL[saved.state.status]}: ${saved.state.reason}\n`,
      );
  } catch (error) {
    if (!(error instanceof UnreachableError)) throw error;
    const summary = `interval ${intervalId} on machine ${machineId} done on ${on}`;
    enqueue(deps.env, { clientId: newClientId(), server: api.server, method: 'PATCH', path, body, summary });
    deps.stderr.write(`${theme.warn('server unreachable')}: ${summary} queued; \`vanbay sync\` sends it\n`);
    if (options.json)
      deps.stdout.write(`${JSON.stringify({ queued: true, machineId, intervalId, ...body })}\n`);
  }
}
