import type { Command } from 'commander';
import { format, startOfWeek } from 'date-fns';
import { z } from 'zod';
import { createApi } from '../lib/api';
import { UsageError, type CliDeps } from '../lib/deps';
import { theme } from '../ui/theme';

const OptionsSchema = z.object({
  start: z.string().optional(),
  json: z.boolean().optional(),
  server: z.string().optional(),
});

/** The figures printed for the eye; `--json` passes the server's object through unchanged. */
const WeekSummarySchema = z
  .object({
    start: z.string(),
    end: z.string(),
    jobsDone: z.number(),
    hoursBilled: z.number(),
    revenueCents: z.number(),
    collectedCents: z.number().optional(),
    unpaid: z.object({ count: z.number(), balanceCents: z.number() }),
    overdue: z.object({ count: z.number(), balanceCents: z.number() }),
    miles: z.number(),
    deductionCents: z.number().nullable(),
    checks: z.object({ pass: z.number(), warn: z.number(), fail: z.number() }).loose(),
    machinesDue: z.array(z.object({}).loose()),
    /** All of them; machinesDue lists only the most urgent. A server without it listed them all. */
    machinesDueTotal: z.number().optional(),
  })
  .loose();

const money = (cents: number | null) => (cents === null ? '—' : `$${(cents / 100).toFixed(2)}`);

/** Monday of the current week on this machine's clock: the mechanic's own week. */
export function thisWeeksMonday(now: Date): string {
  return format(startOfWeek(now, { weekStartsOn: 1 }), 'yyyy-MM-dd');
}

export async function weekAction(deps: CliDeps, raw: unknown, command: Command) {
  const options = OptionsSchema.parse({ ...command.optsWithGlobals(), ...(raw as object) });
  const start = options.start ?? thisWeeksMonday(new Date());
  if (!/^\d{4}-\d{2}-\d{2}$/.test(start)) throw new UsageError(`--start must be YYYY-MM-DD, got "${start}"`);
  const api = createApi(deps, options.server);
  const report = await api.request('GET', '/api/reports/week', z.unknown(), { query: { start } });
  if (options.json) {
    deps.stdout.write(`${JSON.stringify(report)}\n`);
    return;
  }
  const week = WeekSummarySchema.parse(report);
  const rows: [string, string][] = [
    ['Jobs done', String(week.jobsDone)],
    ['Hours billed', week.hoursBilled.toFixed(1)],
    ['Revenue', money(week.revenueCents)],
    ['Unpaid', `${week.unpaid.count} · ${money(week.unpaid.balanceCents)}`],
    ['Overdue', `${week.overdue.count} · ${money(week.overdue.balanceCents)}`],
    ['Miles', `${week.miles.toFixed(1)} · deduction ${money(week.deductionCents)}`],
    [
      'Checks',
      `${theme.pass(`${week.checks.pass} pass`)} ${theme.warn(`${week.checks.warn} warn`)} ${theme.fail(`${week.checks.fail} fail`)}`,
    ],
    ['Machines due', String(week.machinesDueTotal ?? week.machinesDue.length)],
  ];
  deps.stdout.write(`${theme.strong(`Week of ${week.start}`)}\n`);
  for (const [label, value] of rows) deps.stdout.write(`  ${label.padEnd(14)} ${value}\n`);
}
