import type { Command } from 'commander';
import { z } from 'zod';
import { HEALTH_PATH, HealthSchema } from '../../shared/api/health';
import { resolveServer, UsageError, type CliDeps } from '../lib/deps';
import { theme } from '../ui/theme';

export interface HealthResult {
  server: string;
  ok: boolean;
  /** Why the server could not be asked, when it could not. */
  problem?: string;
}

const OptionsSchema = z.object({ json: z.boolean().optional(), server: z.string().optional() });

/** Asks the server whether it and its database are up; never throws for an unreachable server. */
export async function runHealth(deps: CliDeps, server: string): Promise<HealthResult> {
  let url: URL;
  try {
    url = new URL(HEALTH_PATH, server);
  } catch {
    throw new UsageError(`"${server}" is not a server URL (try http://localhost:5180)`);
  }
  try {
    const response = await deps.fetch(url, { signal: AbortSignal.timeout(5_000) });
    const parsed = HealthSchema.safeParse(await response.json().catch(() => null));
    return parsed.success
      ? { server, ok: parsed.data.ok }
      : { server, ok: false, problem: `unexpected answer (HTTP ${response.status})` };
  } catch (error) {
    return { server, ok: false, problem: error instanceof Error ? error.message : String(error) };
  }
}

export async function healthAction(deps: CliDeps, raw: unknown, command: Command) {
  const options = OptionsSchema.parse({ ...command.optsWithGlobals(), ...(raw as object) });
  const result = await runHealth(deps, resolveServer(options.server, deps.env));
  if (options.json) {
    deps.stdout.write(`${JSON.stringify(result)}\n`);
  } else if (result.ok) {
    deps.stdout.write(`${theme.pass('online')}  ${result.server}\n`);
  } else {
    deps.stdout.write(
      `${theme.fail('unreachable')}  ${result.server}  ${theme.muted(result.problem ?? '')}\n`,
    );
  }
  if (!result.ok) process.exitCode = 1;
}
