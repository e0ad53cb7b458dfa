import type { Command } from 'commander';
import { z } from 'zod';
import { SIGN_OUT_PATH } from '../../shared/api/auth';
import { createApi, UnreachableError } from '../lib/api';
import type { CliDeps } from '../lib/deps';
import { forgetSession, loadSession } from '../lib/session-store';
import { theme } from '../ui/theme';

const OptionsSchema = z.object({ json: z.boolean().optional(), server: z.string().optional() });

/**
 * Ends the session on the server (its token is revoked there) and forgets it here. Offline, the
 * local copy is still forgotten; the token then simply runs out.
 */
export async function runLogout(deps: CliDeps, serverFlag: string | undefined) {
  const api = createApi(deps, serverFlag);
  const stored = loadSession(deps.env, api.server);
  let revoked = false;
  if (stored) {
    try {
      await createApi(deps, serverFlag, { token: stored.token }).request('POST', SIGN_OUT_PATH, z.unknown());
      revoked = true;
    } catch (error) {
      // An unreachable server or an already-ended session must not keep the mechanic signed in here.
      if (!(error instanceof UnreachableError) && !(error instanceof Error && error.name === 'ApiError'))
        throw error;
    }
  }
  const forgotten = forgetSession(deps.env, api.server);
  return { server: api.server, signedOut: forgotten, revokedOnServer: revoked };
}

export async function logoutAction(deps: CliDeps, raw: unknown, command: Command) {
  const options = OptionsSchema.parse({ ...command.optsWithGlobals(), ...(raw as object) });
  const result = await runLogout(deps, options.server);
  if (options.json) deps.stdout.write(`${JSON.stringify(result)}\n`);
  else
    deps.stdout.write(
      result.signedOut
        ? `${theme.pass('signed out')}  ${result.server}\n`
        : `not signed in at ${result.server}\n`,
    );
}
