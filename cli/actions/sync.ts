import type { Command } from 'commander';
import { z } from 'zod';
import { resolveServer, type CliDeps } from '../lib/deps';
import { listQueue } from '../lib/queue';
import { syncQueue } from '../lib/sync';
import { theme } from '../ui/theme';

const OptionsSchema = z.object({ json: z.boolean().optional(), server: z.string().optional() });

export async function syncAction(deps: CliDeps, raw: unknown, command: Command) {
  const options = OptionsSchema.parse({ ...command.optsWithGlobals(), ...(raw as object) });
  const progress = options.json
    ? undefined
    : (done: number, total: number, summary: string) =>
        deps.stderr.write(`${theme.muted(`[${done}/${total}]`)} ${summary}\n`);
  const result = await syncQueue(deps, options.server, progress);
  if (options.json) {
    deps.stdout.write(`${JSON.stringify(result)}\n`);
  } else {
    deps.stdout.write(`sent ${result.sent}, ${result.remaining} still queued\n`);
    for (const r of result.rejected)
      deps.stdout.write(`${theme.fail('refused')}  ${r.summary}: ${r.reason}\n`);
    if (result.stoppedBecause) deps.stderr.write(`${theme.warn('stopped')}: ${result.stoppedBecause}\n`);
  }
  if (result.stoppedBecause || result.rejected.length > 0) process.exitCode = 1;
}

export function statusAction(deps: CliDeps, raw: unknown, command: Command) {
  const options = OptionsSchema.parse({ ...command.optsWithGlobals(), ...(raw as object) });
  const server = resolveServer(options.server, deps.env);
  const { entries, unreadable } = listQueue(deps.env);
  const queued = entries.map((e) => ({
    clientId: e.write.clientId,
    server: e.write.server,
    summary: e.write.summary,
    queuedAt: e.write.queuedAt,
  }));
  if (options.json) {
    deps.stdout.write(`${JSON.stringify({ server, queued, unreadable })}\n`);
    return;
  }
  if (queued.length === 0) deps.stdout.write('nothing queued\n');
  for (const q of queued) deps.stdout.write(`${q.queuedAt}  ${q.summary}  ${theme.muted(q.server)}\n`);
  for (const file of unreadable) deps.stdout.write(`${theme.fail('unreadable')}  ${file}\n`);
}
