/**
 * One server per data dir. PGlite has no lock of its own, and two processes writing the same
 * PostgreSQL files corrupt them; a mechanic who runs `npm start` in a second terminal must get a
 * clear refusal instead. The lock is a pid file taken with O_EXCL; one left by a process that is
 * gone (a crash, SIGKILL) is taken over.
 */
import { mkdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import path from 'node:path';

export class DataDirBusyError extends Error {
  override name = 'DataDirBusyError';
}

function isAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (error) {
    // EPERM: it exists but belongs to someone else — still alive.
    return (error as NodeJS.ErrnoException).code === 'EPERM';
  }
}

/** Takes the lock or throws DataDirBusyError; returns the function that gives it back. */
export function lockDataDir(dataDir: string): () => void {
  mkdirSync(dataDir, { recursive: true });
  const file = path.join(dataDir, 'server.pid');
  for (let attempt = 0; attempt < 2; attempt += 1) {
    try {
      writeFileSync(file, `${process.pid}\n`, { flag: 'wx', mode: 0o600 });
      return () => {
        if (readFileSync(file, 'utf8').trim() === String(process.pid)) rmSync(file, { force: true });
      };
    } catch (error) {
      if ((error as NodeJS.ErrnoException).code !== 'EEXIST') throw error;
      const holder = Number(readFileSync(file, 'utf8').trim());
      if (Number.isInteger(holder) && holder > 0 && holder !== process.pid && isAlive(holder)) {
        throw new DataDirBusyError(
          `Another Vanbay server (pid ${holder}) is using ${dataDir}. Stop it first, or set VANBAY_DATA_DIR to another folder.`,
        );
      }
      rmSync(file, { force: true }); // left behind by a process that is gone
    }
  }
  throw new DataDirBusyError(`Could not take the lock on ${dataDir}.`);
}
