import { mkdtempSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runCli } from '../../cli/program';
import { DEMO_PASSWORD } from '../../server/db/seed-data';
import { listeningApi, type TestApi } from '../helpers/api';
import { fakeDeps } from '../helpers/cli';

let api: TestApi;
let url: string;
beforeAll(async () => {
  const listening = await listeningApi();
  api = listening;
  url = listening.url;
});
afterAll(() => api.close());

function cli(env: NodeJS.ProcessEnv = {}) {
  const config = mkdtempSync(path.join(tmpdir(), 'vanbay-config-'));
  const base = { VANBAY_URL: url, XDG_CONFIG_HOME: config, ...env };
  return {
    config,
    run: async (...argv: string[]) => {
      const io = fakeDeps(fetch, base);
      const code = await runCli(argv, io.deps);
      return { code, stdout: io.stdout(), stderr: io.stderr() };
    },
  };
}

describe('vanbay login, whoami and logout against a real server', () => {
  it('signs in, keeps the session in $XDG_CONFIG_HOME/vanbay with mode 0600, and whoami reads it', async () => {
    const { run, config } = cli();
    const login = await run(
      'login',
      '--email',
      'owner@ridgeback.test',
      '--password',
      DEMO_PASSWORD,
      '--json',
    );
    expect(login.code).toBe(0);
    expect(JSON.parse(login.stdout).user.role).toBe('owner');
    const file = path.join(config, 'vanbay', 'sessions.json');
    expect(statSync(file).mode & 0o777).toBe(0o600);
    const whoami = await run('whoami', '--json');
    expect(whoami.code).toBe(0);
    const me = JSON.parse(whoami.stdout);
    expect(me).toMatchObject({
      email: 'owner@ridgeback.test',
      role: 'owner',
      user: { role: 'owner' },
      server: url,
    });
  });

  it('logs out: the token is revoked on the server and forgotten here', async () => {
    const { run } = cli();
    await run('login', '--email', 'helper@ridgeback.test', '--password', DEMO_PASSWORD);
    const logout = await run('logout', '--json');
    expect(JSON.parse(logout.stdout)).toMatchObject({ signedOut: true, revokedOnServer: true });
    const whoami = await run('whoami');
    expect(whoami.code).toBe(1);
    expect(whoami.stderr).toMatch(/vanbay login/);
  });

  it('takes VANBAY_TOKEN instead of a stored session', async () => {
    const { run } = cli({ VANBAY_TOKEN: api.tokens.bookkeeper });
    const whoami = await run('whoami', '--json');
    expect(JSON.parse(whoami.stdout).role).toBe('bookkeeper');
  });

  it('says no with exit 1 to a wrong password, and exit 2 when a flag is missing and nobody can be asked', async () => {
    const { run } = cli();
    const wrong = await run('login', '--email', 'owner@ridgeback.test', '--password', 'nope');
    expect(wrong.code).toBe(1);
    expect(wrong.stderr.trim()).toBe('Wrong e-mail or password.');
    const missing = await run('login', '--email', 'owner@ridgeback.test');
    expect(missing.code).toBe(2);
    expect(missing.stderr.trim().split('\n')).toHaveLength(1);
    expect(missing.stdout).toBe('');
  });

  it('asks for what is missing when a person is at the keyboard', async () => {
    const config = mkdtempSync(path.join(tmpdir(), 'vanbay-config-'));
    const io = fakeDeps(fetch, { VANBAY_URL: url, XDG_CONFIG_HOME: config });
    const asked: string[] = [];
    io.deps.interactive = true;
    io.deps.prompt = {
      input: async ({ message }) => (asked.push(message), 'books@ridgeback.test'),
      password: async ({ message }) => (asked.push(message), DEMO_PASSWORD),
    };
    expect(await runCli(['login'], io.deps)).toBe(0);
    expect(asked).toEqual(['E-mail', 'Password']);
  });
});
