/**
 * `npm start`'s entry point (server/index.ts) as a process of its own, on a data dir of the test's
 * choosing. Run as `node --import tsx`, so the process that listens is the one a signal reaches
 * (tsx's own CLI would put the server in a child process behind it).
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { PGlite } from '@electric-sql/pglite';
import { execa, type ResultPromise } from 'execa';
import { inject } from 'vitest';

export interface ServerProcess {
  child: ResultPromise;
  url: string;
  /** Everything it printed so far, stdout and stderr interleaved. */
  output(): string;
}

export async function startServerProcess(
  dataDir: string,
  env: Record<string, string> = {},
): Promise<ServerProcess> {
  const child = execa('node', ['--import', 'tsx', 'server/index.ts'], {
    env: { VANBAY_DATA_DIR: dataDir, PORT: '0', HOST: '127.0.0.1', ...env },
    all: true,
    reject: false,
  });
  let seen = '';
  child.all!.on('data', (chunk: Buffer) => {
    seen += chunk.toString();
  });
  const url = await new Promise<string>((resolve, reject) => {
    child.all!.on('data', () => {
      const match = /running at http:\/\/localhost:(\d+)/.exec(seen);
      if (match) resolve(`http://127.0.0.1:${match[1]}`);
    });
    void child.then(() => reject(new Error(`server exited before listening:\n${seen}`)));
  });
  return { child, url, output: () => seen };
}

/**
 * A data dir holding the seeded test template (tests/helpers/global-setup.ts) as files, so a
 * server process starts on the demo data without paying initdb and the seed again.
 */
export async function seededDataDir(dataDir: string): Promise<PGlite> {
  return PGlite.create({
    dataDir: path.join(dataDir, 'pg'),
    loadDataDir: new Blob([readFileSync(inject('seededTemplatePath'))]),
  });
}
