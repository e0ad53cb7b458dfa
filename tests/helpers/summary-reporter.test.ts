import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { execa } from 'execa';
import { afterAll, describe, expect, it } from 'vitest';
import { PROJECT_ROOT } from '../../server/config';

/**
 * The closing line is what a reader of the CI log trusts, so it is checked against Vitest itself:
 * a real `vitest run` over small files that pass, fail, skip, break in a hook and break on import.
 */
const dir = mkdtempSync(path.join(tmpdir(), 'vanbay-summary-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const files: Record<string, string> = {
  'passes.test.ts': `import { it, expect } from 'vitest';
it('adds', () => expect(1 + 1).toBe(2));
it.skip('is put off', () => {});
it.todo('is still to write');`,
  'fails.test.ts': `import { it, expect } from 'vitest';
it('is wrong', () => expect(1 + 1).toBe(3));
it('is right', () => expect(2).toBe(2));`,
  'hook-breaks.test.ts': `import { beforeAll, describe, it, expect } from 'vitest';
describe('after a broken setup', () => {
  beforeAll(() => { throw new Error('setup broke'); });
  it('never runs one', () => expect(1).toBe(1));
  it('never runs two', () => expect(1).toBe(1));
  it.skip('was skipped anyway', () => {});
});`,
  'leaks.test.ts': `import { it, expect } from 'vitest';
it('passes but leaves a rejection behind', () => {
  void Promise.reject(new TypeError('left behind'));
  expect(1).toBe(1);
});`,
  'setup-breaks.mjs': `export default () => { throw new Error('global setup broke'); };`,
  'import-breaks.test.ts': `import { it } from 'vitest';
throw new Error('import broke');
it('is never collected', () => {});`,
};

async function lastLine(only: string[], globalSetup?: string) {
  for (const [name, text] of Object.entries(files)) writeFileSync(path.join(dir, name), `${text}\n`);
  const config = path.join(dir, 'vitest.config.mjs');
  const test = { include: only, ...(globalSetup ? { globalSetup: path.join(dir, globalSetup) } : {}) };
  writeFileSync(config, `export default { test: ${JSON.stringify(test)} };\n`);
  const result = await execa(
    path.join(PROJECT_ROOT, 'node_modules/.bin/vitest'),
    [
      'run',
      '--root',
      dir,
      '--config',
      config,
      `--reporter=${path.join(PROJECT_ROOT, 'tests/helpers/summary-reporter.ts')}`,
    ],
    { reject: false, env: { CI: '1' } },
  );
  const lines = result.stdout.trim().split('\n');
  return { line: lines.at(-1), before: lines.at(-2), exitCode: result.exitCode };
}

describe('the closing summary line', () => {
  it('counts passes, failures and the tests marked to skip or still to write', async () => {
    const { line, exitCode } = await lastLine(['passes.test.ts', 'fails.test.ts']);
    expect(line).toBe('2 passed, 1 failed, 2 skipped');
    expect(exitCode).toBe(1);
  });

  it('counts the tests a broken beforeAll kept from running as failed, and a file that fails to import', async () => {
    const { line, exitCode } = await lastLine(['hook-breaks.test.ts', 'import-breaks.test.ts']);
    // Two tests the hook stopped, one file that never got as far as its tests; the it.skip stays skipped.
    expect(line).toBe('0 passed, 3 failed, 1 skipped');
    expect(exitCode).toBe(1);
  });

  it('counts an unhandled rejection as a failure and says what it was just above the counts', async () => {
    const { line, before, exitCode } = await lastLine(['leaks.test.ts']);
    expect(line).toBe('1 passed, 1 failed, 0 skipped');
    expect(before).toMatch(/^unhandled: TypeError: left behind \(while leaks\.test\.ts ran, at leaks\.test\.ts:3:\d+\)$/);
    expect(exitCode).toBe(1);
  });

  it('counts a global setup that throws, so that no test runs, as a failure', async () => {
    const { line, exitCode } = await lastLine(['passes.test.ts'], 'setup-breaks.mjs');
    expect(line).toBe('0 passed, 1 failed, 0 skipped');
    expect(exitCode).toBe(1);
  });
});
