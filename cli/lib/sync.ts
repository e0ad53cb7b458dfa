/**
 * Replays the offline queue, oldest first, each write exactly once: a success (new or a replay the
 * server recognises by client id) removes it; an unreachable server stops the replay with the
 * rest kept; a write the server refuses for good is set aside in `queue/rejected/` and reported.
 */
import { mkdirSync, renameSync } from 'node:fs';
import path from 'node:path';
import { z } from 'zod';
import { ApiError, createApi, UnreachableError } from './api';
import type { CliDeps } from './deps';
import { listQueue, removeQueued, type QueueFile } from './queue';

export interface SyncResult {
  server: string;
  sent: number;
  rejected: { summary: string; reason: string }[];
  remaining: number;
  stoppedBecause: string | null;
}

/** Refusals that will not change by trying again: the write itself is wrong. */
const permanent = (error: ApiError) =>
  error.status >= 400 && error.status < 500 && ![401, 408, 425, 429].includes(error.status);

function setAside(entry: QueueFile) {
  const dir = path.join(path.dirname(entry.file), 'rejected');
  mkdirSync(dir, { recursive: true, mode: 0o700 });
  renameSync(entry.file, path.join(dir, path.basename(entry.file)));
}

export async function syncQueue(
  deps: CliDeps,
  serverFlag: string | undefined,
  onProgress?: (done: number, total: number, summary: string) => void,
): Promise<SyncResult> {
  const api = createApi(deps, serverFlag);
  const mine = listQueue(deps.env).entries.filter((e) => e.write.server === api.server);
  const result: SyncResult = {
    server: api.server,
    sent: 0,
    rejected: [],
    remaining: mine.length,
    stoppedBecause: null,
  };
  for (const [index, entry] of mine.entries()) {
    try {
      await api.request(entry.write.method, entry.write.path, z.unknown(), {
        // A create carries its client id so a replay lands once; an update (ending a trip) is
        // idempotent by itself and its schema takes no id.
        body:
          entry.write.method === 'POST'
            ? { ...entry.write.body, clientId: entry.write.clientId }
            : entry.write.body,
      });
      removeQueued(entry);
      result.sent += 1;
    } catch (error) {
      if (error instanceof ApiError && permanent(error)) {
        setAside(entry);
        result.rejected.push({ summary: entry.write.summary, reason: error.message });
      } else if (error instanceof UnreachableError || error instanceof ApiError) {
        result.stoppedBecause = error.message;
        break;
      } else {
        throw error;
      }
    }
    result.remaining -= 1;
    onProgress?.(index + 1, mine.length, entry.write.summary);
  }
  result.remaining = mine.length - result.sent - result.rejected.length;
  return result;
}
