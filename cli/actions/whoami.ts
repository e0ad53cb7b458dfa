import type { Command } from 'commander';
import { z } from 'zod';
import { ME_PATH, MeResponseSchema } from '../../shared/api/auth';
import { createApi } from '../lib/api';
import type { CliDeps } from '../lib/deps';

const OptionsSchema = z.object({ json: z.boolean().optional(), server: z.string().optional() });

/** Asks the server who the session belongs to, so a revoked or expired one shows at once. */
export async function runWhoami(deps: CliDeps, serverFlag: string | undefined) {
  const api = createApi(deps, serverFlag);
  const { user } = await api.request('GET', ME_PATH, MeResponseSchema);
  return { server: api.server, user };
}

export async function whoamiAction(deps: CliDeps, raw: unknown, command: Command) {
  const options = OptionsSchema.parse({ ...command.optsWithGlobals(), ...(raw as object) });
  const { server, user } = await runWhoami(deps, options.server);
  // The user's fields at the top (id, email, role, name) and nested as /api/auth/me has them.
  if (options.json) deps.stdout.write(`${JSON.stringify({ ...user, server, user })}\n`);
  else deps.stdout.write(`${user.name} <${user.email}>  ${user.role}  at ${server}\n`);
}
