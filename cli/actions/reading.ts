import type { Command } from 'commander';
import { z } from 'zod';
import { QUANTITIES, type Quantity } from '../../shared/api/readings';
import { readingToCanonical, UnitError } from '../../shared/units';
import { createApi, UnreachableError } from '../lib/api';
import { UsageError, type CliDeps } from '../lib/deps';
import { enqueue, newClientId } from '../lib/queue';
import { syncQueue } from '../lib/sync';
import { theme } from '../ui/theme';

/** What the server answers for a reading; its full schema lives with the readings API. */
const SavedReadingSchema = z
  .object({
    id: z.number(),
    quantity: z.string(),
    value: z.number(),
    unit: z.string(),
    judgement: z.object({ verdict: z.enum(['pass', 'warn', 'fail']), reason: z.string() }).nullish(),
  })
  .loose();

const OptionsSchema = z.object({
  note: z.string().max(2000).optional(),
  json: z.boolean().optional(),
  server: z.string().optional(),
});

export function parseReadingArgs(jobText: string, quantityText: string, valueText: string) {
  if (!/^\d+$/.test(jobText) || Number(jobText) <= 0)
    throw new UsageError(`JOB must be a job number, got "${jobText}"`);
  const quantity = quantityText.toLowerCase() as Quantity;
  if (!QUANTITIES.includes(quantity)) {
    throw new UsageError(`unknown quantity "${quantityText}" (one of ${QUANTITIES.join(', ')})`);
  }
  try {
    // Checked here first, so a typo is caught at the roadside even when the reading must wait.
    const canonical = readingToCanonical(quantity, valueText, quantity === 'afr' ? 'ratio' : undefined);
    return { jobId: Number(jobText), quantity, valueText: valueText.trim(), canonical };
  } catch (error) {
    if (error instanceof UnitError) throw new UsageError(error.message);
    throw error;
  }
}

export async function runReadingAdd(
  deps: CliDeps,
  args: { job: string; quantity: string; value: string },
  options: z.infer<typeof OptionsSchema>,
) {
  const reading = parseReadingArgs(args.job, args.quantity, args.value);
  const api = createApi(deps, options.server);
  const clientId = newClientId();
  const path = `/api/jobs/${reading.jobId}/readings`;
  const body = {
    quantity: reading.quantity,
    value: reading.valueText,
    takenAt: new Date().toISOString(),
    ...(options.note ? { note: options.note } : {}),
  };
  try {
    // Older queued writes go first, so the job's readings keep the order they were taken in.
    const flushed = await syncQueue(deps, options.server);
    if (flushed.stoppedBecause) throw new UnreachableError(flushed.stoppedBecause);
    const saved = await api.request('POST', path, SavedReadingSchema, { body: { ...body, clientId } });
    return { queued: false as const, clientId, reading: saved };
  } catch (error) {
    if (!(error instanceof UnreachableError)) throw error;
    const summary = `${reading.quantity} ${reading.valueText} on job ${reading.jobId}`;
    enqueue(deps.env, { clientId, server: api.server, method: 'POST', path, body, summary });
    return {
      queued: true as const,
      clientId,
      reading: { jobId: reading.jobId, quantity: reading.quantity, ...reading.canonical },
    };
  }
}

export async function readingAddAction(
  deps: CliDeps,
  job: string,
  quantity: string,
  value: string,
  raw: unknown,
  command: Command,
) {
  const options = OptionsSchema.parse({ ...command.optsWithGlobals(), ...(raw as object) });
  const result = await runReadingAdd(deps, { job, quantity, value }, options);
  if (result.queued) {
    deps.stderr.write(`${theme.warn('server unreachable')}: reading queued; \`vanbay sync\` sends it\n`);
  }
  if (options.json) {
    deps.stdout.write(
      `${JSON.stringify(result.queued ? { queued: true, clientId: result.clientId, ...result.reading } : { queued: false, ...result.reading })}\n`,
    );
    return;
  }
  if (result.queued) return;
  const judged = result.reading.judgement;
  const verdict = judged ? `  ${theme[judged.verdict](judged.verdict.toUpperCase())}` : '';
  deps.stdout.write(`reading ${result.reading.id}: ${result.reading.quantity} ${value}${verdict}\n`);
  if (judged) deps.stdout.write(`${theme.muted(judged.reason)}\n`);
}
