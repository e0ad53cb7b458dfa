import { existsSync, mkdtempSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runCli } from '../../cli/program';
import type { Prompter } from '../../cli/lib/deps';
import { queryRows } from '../../server/db/client';
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

const workDir = () => mkdtempSync(path.join(tmpdir(), 'vanbay-backup-cli-'));

/** The CLI on a fresh config dir, signed in by VANBAY_TOKEN; optionally "at a terminal" with a fake prompt. */
async function vanbay(argv: string[], options: { token?: string; terminal?: Prompter } = {}) {
  const io = fakeDeps(fetch, {
    VANBAY_URL: url,
    XDG_CONFIG_HOME: workDir(),
    VANBAY_TOKEN: options.token ?? api.tokens.owner,
  });
  if (options.terminal) {
    io.deps.interactive = true;
    io.deps.prompt = options.terminal;
  }
  const code = await runCli(argv, io.deps);
  return { code, stdout: io.stdout(), stderr: io.stderr() };
}

/** Every business-owned row, per table, in PostgreSQL's text form of the row; a restore's own audit row left out. */
async function snapshot(): Promise<Record<string, string[]>> {
  const tables = await queryRows<{ table_name: string }>(
    api.database.db,
    sql`select table_name from information_schema.columns
        where column_name = 'business_id' and table_schema = current_schema() order by table_name`,
  );
  const parts: Record<string, string[]> = {};
  for (const table of ['businesses', ...tables.map((row) => row.table_name)]) {
    const rows = await queryRows<{ row: string }>(
      api.database.db,
      table === 'audit_events'
        ? sql`select x::text as row from audit_events x where x.action <> 'backup.restored' order by 1`
        : sql`select x::text as row from ${sql.identifier(table)} x order by 1`,
    );
    parts[table] = rows.map((row) => row.row);
  }
  return parts;
}

const addCustomer = (name: string) =>
  fetch(`${url}/api/customers`, {
    method: 'POST',
    headers: { authorization: `Bearer ${api.tokens.owner}`, 'content-type': 'application/json' },
    body: JSON.stringify({ name }),
  }).then((response) => expect(response.status).toBe(201));

describe('vanbay backup and restore', () => {
  it('round-trips: a backup restored after changes puts every table back', async () => {
    const file = path.join(workDir(), 'van.json');
    const before = await snapshot();
    const backup = await vanbay(['backup', file, '--json']);
    expect(backup.code).toBe(0);
    expect(backup.stderr).toBe('');
    const summary = JSON.parse(backup.stdout) as {
      file: string;
      bytes: number;
      tables: Record<string, number>;
    };
    expect(summary.file).toBe(file);
    expect(summary.bytes).toBe(statSync(file).size);
    // Password hashes inside: readable by its owner only (POSIX mode bits, 0600).
    expect(statSync(file).mode & 0o777).toBe(0o600);
    expect(existsSync(`${file}.partial`)).toBe(false);
    expect(Object.keys(summary.tables).sort()).toEqual(Object.keys(before).filter((t) => t !== 'businesses'));
    for (const [table, count] of Object.entries(summary.tables))
      expect(count, table).toBe(before[table]!.length);

    await addCustomer('Pell Harrow');
    await api.database.db.execute(sql`delete from trips`);
    expect(await snapshot()).not.toEqual(before);

    const restored = await vanbay(['restore', file, '--yes', '--json']);
    expect(restored.code).toBe(0);
    expect(JSON.parse(restored.stdout)).toMatchObject({ business: 'ridgeback', tables: summary.tables });
    expect(await snapshot()).toEqual(before);
  });

  it('shows progress on stderr and the counts on stdout without --json', async () => {
    const file = path.join(workDir(), 'van.json');
    const backup = await vanbay(['backup', file]);
    expect(backup.code).toBe(0);
    const bytes = statSync(file).size;
    expect(backup.stderr).toMatch(/^received [\d.]+ (B|KiB|MiB)$/m);
    expect(backup.stdout).toMatch(/^backed up \d+ rows in \d+ tables to .*van\.json/);

    const restored = await vanbay(['restore', file, '--yes']);
    expect(restored.code).toBe(0);
    expect(restored.stderr).toMatch(/^sent [\d.]+ (B|KiB|MiB) of [\d.]+ (KiB|MiB) \(\d+ %\)$/m);
    expect(restored.stderr.trim().split('\n').at(-1)).toMatch(/\(100 %\)$/);
    expect(restored.stdout).toMatch(/^restored ridgeback from the backup of /);
    expect(restored.stdout).toMatch(/^ {2}customers +\d+$/m);
    expect(bytes).toBeGreaterThan(0);
  });

  it('will not restore without a yes: exit 2 with no terminal, exit 1 when the answer is no', async () => {
    const file = path.join(workDir(), 'van.json');
    expect((await vanbay(['backup', file, '--json'])).code).toBe(0);
    await addCustomer('Quenby Lusk');
    const before = await snapshot();

    const noTerminal = await vanbay(['restore', file]);
    expect(noTerminal.code).toBe(2);
    expect(noTerminal.stderr.trim().split('\n')).toHaveLength(1);
    expect(noTerminal.stderr).toMatch(/--yes/);

    const asked: string[] = [];
    const declined = await vanbay(['restore', file], {
      terminal: {
        input: async ({ message }) => {
          asked.push(message);
          return 'no';
        },
        password: async () => '',
      },
    });
    expect(declined.code).toBe(1);
    expect(asked[0]).toMatch(/Replace ALL data/);
    expect(declined.stderr).toMatch(/nothing was changed/);
    expect(await snapshot()).toEqual(before);
  });

  it('takes bad files as bad input (exit 2) and a refusal from the server as exit 1', async () => {
    const dir = workDir();
    const before = await snapshot();
    expect((await vanbay(['restore', path.join(dir, 'missing.json'), '--yes'])).code).toBe(2);
    writeFileSync(path.join(dir, 'other.json'), JSON.stringify({ format: 'shop-export' }));
    const wrong = await vanbay(['restore', path.join(dir, 'other.json'), '--yes']);
    expect(wrong.code).toBe(2);
    expect(wrong.stderr).toMatch(/not a Vanbay backup/);
    expect((await vanbay(['backup', path.join(dir, 'no-such-folder', 'van.json')])).code).toBe(2);

    // Another business's backup: the server says no.
    const file = path.join(dir, 'van.json');
    expect((await vanbay(['backup', file, '--json'])).code).toBe(0);
    const document = JSON.parse(readFileSync(file, 'utf8')) as { business: { slug: string } };
    document.business.slug = 'ember-hollow';
    writeFileSync(file, JSON.stringify(document));
    const refused = await vanbay(['restore', file, '--yes']);
    expect(refused.code).toBe(1);
    expect(refused.stderr).toMatch(/another business/);
    expect(await snapshot()).toEqual(before);
  });

  it('is for the owner: a helper gets exit 1 and no file', async () => {
    const file = path.join(workDir(), 'van.json');
    const result = await vanbay(['backup', file], { token: api.tokens.helper });
    expect(result.code).toBe(1);
    expect(existsSync(file)).toBe(false);
    expect(existsSync(`${file}.partial`)).toBe(false);
  });
});
