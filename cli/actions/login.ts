import type { Command } from 'commander';
import { z } from 'zod';
import { SIGN_IN_PATH, SignInResponseSchema } from '../../shared/api/auth';
import { createApi } from '../lib/api';
import { UsageError, type CliDeps } from '../lib/deps';
import { saveSession } from '../lib/session-store';
import { theme } from '../ui/theme';

const OptionsSchema = z.object({
  email: z.string().optional(),
  password: z.string().optional(),
  json: z.boolean().optional(),
  server: z.string().optional(),
});

/** A value from its flag, else asked for when a person is at the keyboard, else bad input. */
async function ask(
  deps: CliDeps,
  given: string | undefined,
  flag: string,
  question: (prompt: NonNullable<CliDeps['prompt']>) => Promise<string>,
): Promise<string> {
  if (given !== undefined && given !== '') return given;
  if (!deps.interactive || !deps.prompt) throw new UsageError(`give ${flag} (no terminal to ask on)`);
  return question(deps.prompt);
}

export async function runLogin(deps: CliDeps, options: z.infer<typeof OptionsSchema>) {
  const email = await ask(deps, options.email, '--email', (p) => p.input({ message: 'E-mail' }));
  const password = await ask(deps, options.password, '--password', (p) =>
    p.password({ message: 'Password' }),
  );
  const api = createApi(deps, options.server, { token: null });
  const session = await api.request('POST', SIGN_IN_PATH, SignInResponseSchema, {
    body: { email, password },
  });
  saveSession(deps.env, api.server, {
    token: session.token,
    user: session.user,
    signedInAt: new Date().toISOString(),
  });
  return { server: api.server, user: session.user };
}

export async function loginAction(deps: CliDeps, raw: unknown, command: Command) {
  const options = OptionsSchema.parse({ ...command.optsWithGlobals(), ...(raw as object) });
  const result = await runLogin(deps, options);
  if (options.json) deps.stdout.write(`${JSON.stringify(result)}\n`);
  else
    deps.stdout.write(
      `${theme.pass('signed in')}  ${result.user.name} (${result.user.role}) at ${result.server}\n`,
    );
}
