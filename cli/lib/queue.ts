/**
 * The offline queue: writes made while the server cannot be reached wait on disk, one file per
 * write under `<config>/vanbay/queue/`, and are replayed in order. Each carries the client id the
 * server de-duplicates on, so a write whose answer was lost is sent again without landing twice.
 */
import { randomUUID } from 'node:crypto';
import { existsSync, mkdirSync, readdirSync, readFileSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { z } from 'zod';
import { configDir } from './session-store';

export const QueuedWriteSchema = z.object({
  clientId: z.uuid(),
  server: z.string(),
  method: z.enum(['POST', 'PATCH']),
  path: z.string(),
  body: z.record(z.string(), z.unknown()),
  /** What it is, for `vanbay status`: "reading 43 psi on job 12". */
  summary: z.string(),
  queuedAt: z.string(),
});
export type QueuedWrite = z.infer<typeof QueuedWriteSchema>;

const queueDir = (env: NodeJS.ProcessEnv) => path.join(configDir(env), 'queue');

export function newClientId(): string {
  return randomUUID();
}

export function enqueue(
  env: NodeJS.ProcessEnv,
  write: Omit<QueuedWrite, 'queuedAt'>,
  now = new Date(),
): QueuedWrite {
  const dir = queueDir(env);
  mkdirSync(dir, { recursive: true, mode: 0o700 });
  const entry: QueuedWrite = { ...write, queuedAt: now.toISOString() };
  // Time first in the name, so a directory listing is the replay order.
  const name = `${now.getTime().toString().padStart(15, '0')}-${write.clientId}.json`;
  const temp = path.join(dir, `.${name}.tmp`);
  writeFileSync(temp, JSON.stringify(entry), { mode: 0o600 });
  renameSync(temp, path.join(dir, name));
  return entry;
}

export interface QueueFile {
  file: string;
  write: QueuedWrite;
}

/** Everything waiting, oldest first; a file that cannot be read is reported, never dropped. */
export function listQueue(env: NodeJS.ProcessEnv): { entries: QueueFile[]; unreadable: string[] } {
  const dir = queueDir(env);
  if (!existsSync(dir)) return { entries: [], unreadable: [] };
  const entries: QueueFile[] = [];
  const unreadable: string[] = [];
  for (const name of readdirSync(dir)
    .filter((n) => n.endsWith('.json') && !n.startsWith('.'))
    .sort()) {
    const file = path.join(dir, name);
    try {
      entries.push({ file, write: QueuedWriteSchema.parse(JSON.parse(readFileSync(file, 'utf8'))) });
    } catch {
      unreadable.push(file);
    }
  }
  return { entries, unreadable };
}

export function removeQueued(entry: QueueFile): void {
  rmSync(entry.file, { force: true });
}
