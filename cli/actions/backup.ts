/**
 * `vanbay backup FILE` and `vanbay restore FILE`: the business's whole data to one file and back
 * (PRODUCT.md, "Backup and restore"). The file holds every customer's details and the sign-ins'
 * password hashes, so it is written readable by its owner only (0600) and must be kept like the
 * database itself.
 */
import { existsSync, readFileSync, renameSync, rmSync, statSync } from 'node:fs';
import { open, type FileHandle } from 'node:fs/promises';
import path from 'node:path';
import type { Command } from 'commander';
import { z } from 'zod';
import {
  BACKUP_CONTENT_TYPE,
  BACKUP_MAX_BYTES,
  BACKUP_PATH,
  BACKUP_RESTORE_PATH,
  BackupDocumentSchema,
  backupCounts,
  RestoreResultSchema,
  type BackupDocument,
  type RestoreResult,
} from '../../shared/api/backup';
import { ErrorBodySchema } from '../../shared/api/errors';
import { ApiError, createApi, UnreachableError } from '../lib/api';
import { UsageError, type CliDeps } from '../lib/deps';
import { resolveToken } from '../lib/session-store';
import { theme } from '../ui/theme';

const OptionsSchema = z.object({ json: z.boolean().optional(), server: z.string().optional() });
const RestoreOptionsSchema = OptionsSchema.extend({
  yes: z.boolean().optional(),
  force: z.boolean().optional(),
});

/** A download that sends nothing for this long has stalled: give up rather than hang. */
const IDLE_MS = 60_000;
const UPLOAD_CHUNK_BYTES = 256 * 1024;
/** Progress is shown at most once per this many bytes. */
const PROGRESS_STEP_BYTES = 1024 * 1024;

export function formatBytes(bytes: number): string {
  if (bytes < 1024) return `${bytes} B`;
  if (bytes < 1024 * 1024) return `${(bytes / 1024).toFixed(1)} KiB`;
  return `${(bytes / 1024 / 1024).toFixed(1)} MiB`;
}

/** Bytes so far, on stderr: rewritten in place on a terminal, a line per MiB otherwise. */
export function progressOn(deps: CliDeps, verb: string, total?: number) {
  let shownStep = -1;
  const line = (bytes: number) =>
    `${verb} ${formatBytes(bytes)}${total ? ` of ${formatBytes(total)} (${Math.floor((bytes / total) * 100)} %)` : ''}`;
  const show = (bytes: number, last: boolean) =>
    deps.stderr.write(
      deps.interactive ? `\r${theme.muted(line(bytes))}${last ? '\n' : ''}` : `${line(bytes)}\n`,
    );
  return {
    update(bytes: number) {
      const step = Math.floor(bytes / PROGRESS_STEP_BYTES);
      if (step === shownStep) return;
      shownStep = step;
      show(bytes, false);
    },
    done: (bytes: number) => show(bytes, true),
  };
}

/** The server's refusal as the CLI's error (exit 1), in the words of cli/lib/api.ts. */
async function refusal(response: Response, token: string | null): Promise<ApiError> {
  const parsed = ErrorBodySchema.safeParse(await response.json().catch(() => undefined));
  if (response.status === 401) {
    return new ApiError(
      401,
      'unauthorized',
      token
        ? 'your session has ended: sign in again with `vanbay login`'
        : 'not signed in: run `vanbay login` first (or set VANBAY_TOKEN)',
    );
  }
  return parsed.success
    ? new ApiError(response.status, parsed.data.error.code, parsed.data.error.message)
    : new ApiError(response.status, 'http_error', `the server answered HTTP ${response.status}`);
}

/** One request outside createApi (its bodies are JSON and its answers small), with the same errors. */
async function call(
  deps: CliDeps,
  serverFlag: string | undefined,
  where: string,
  init: RequestInit & { duplex?: 'half' },
): Promise<Response> {
  const server = createApi(deps, serverFlag).server;
  const token = resolveToken(deps.env, server);
  let response: Response;
  try {
    response = await deps.fetch(new URL(where, server), {
      ...init,
      headers: {
        ...(init.headers as Record<string, string>),
        ...(token ? { authorization: `Bearer ${token}` } : {}),
      },
    });
  } catch (error) {
    throw new UnreachableError(
      `cannot reach ${server}: ${error instanceof Error ? error.message : String(error)}`,
    );
  }
  if (!response.ok) throw await refusal(response, token);
  return response;
}

/** An abort signal that fires once nothing has happened for `ms`; `touch` on every sign of life. */
function idleSignal(ms: number) {
  const controller = new AbortController();
  let timer = setTimeout(() => controller.abort(), ms);
  return {
    signal: controller.signal,
    touch() {
      clearTimeout(timer);
      timer = setTimeout(() => controller.abort(), ms);
    },
    clear: () => clearTimeout(timer),
  };
}

function parseBackup(text: string): BackupDocument | string {
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch {
    return 'not JSON, or cut short';
  }
  const parsed = BackupDocumentSchema.safeParse(json);
  if (parsed.success) return parsed.data;
  const issue = parsed.error.issues[0];
  return issue ? `${issue.path.join('.') || 'document'}: ${issue.message}` : 'not a Vanbay backup';
}

export interface BackupSummary {
  file: string;
  bytes: number;
  tables: Record<string, number>;
}

/**
 * Streams the server's backup to FILE.partial, checks it is a whole backup document, then renames
 * it to FILE: FILE is never half a backup, and an older FILE survives any failure.
 */
export async function runBackup(
  deps: CliDeps,
  file: string,
  options: z.infer<typeof OptionsSchema>,
): Promise<BackupSummary> {
  const target = path.resolve(file);
  if (existsSync(target) && statSync(target).isDirectory())
    throw new UsageError(
      `${file} is a folder: give the backup a file name, e.g. ${path.join(file, 'vanbay.json')}`,
    );
  if (!existsSync(path.dirname(target))) throw new UsageError(`there is no folder ${path.dirname(target)}`);
  const idle = idleSignal(IDLE_MS);
  const partial = `${target}.partial`;
  const shown = options.json ? null : progressOn(deps, 'received');
  let bytes = 0;
  let out: FileHandle | null = null;
  try {
    const response = await call(deps, options.server, BACKUP_PATH, {
      headers: { accept: 'application/json' },
      signal: idle.signal,
    });
    out = await open(partial, 'w', 0o600);
    for await (const chunk of response.body as unknown as AsyncIterable<Uint8Array>) {
      idle.touch();
      await out.write(chunk);
      bytes += chunk.length;
      shown?.update(bytes);
    }
    await out.sync();
  } catch (error) {
    await out?.close();
    out = null;
    rmSync(partial, { force: true });
    if (error instanceof ApiError || error instanceof UnreachableError) throw error;
    const local = (error as NodeJS.ErrnoException).syscall !== undefined;
    const why = local
      ? `cannot write ${partial} (${(error as Error).message})`
      : idle.signal.aborted
        ? `the server sent nothing for ${IDLE_MS / 1000} s`
        : 'the download broke off';
    throw new Error(`${why} after ${formatBytes(bytes)}: nothing was written to ${file}`, { cause: error });
  } finally {
    idle.clear();
    await out?.close();
  }
  shown?.done(bytes);
  const document = parseBackup(readFileSync(partial, 'utf8'));
  if (typeof document === 'string') {
    rmSync(partial, { force: true });
    throw new Error(
      `the server's backup is incomplete or unreadable (${document}): nothing was written to ${file}`,
    );
  }
  renameSync(partial, target);
  if (bytes > BACKUP_MAX_BYTES) {
    deps.stderr.write(
      `${theme.warn('note')}: at ${formatBytes(bytes)} this backup is over the ${formatBytes(BACKUP_MAX_BYTES)} a restore accepts\n`,
    );
  }
  return { file: target, bytes, tables: backupCounts(document) };
}

/** The file, read and checked before anything is sent: a wrong file is bad input (exit 2). */
function readBackupFile(file: string): { document: BackupDocument; size: number } {
  if (!existsSync(file) || !statSync(file).isFile()) throw new UsageError(`there is no file ${file}`);
  const size = statSync(file).size;
  if (size > BACKUP_MAX_BYTES)
    throw new UsageError(
      `${file} is ${formatBytes(size)}, over the ${formatBytes(BACKUP_MAX_BYTES)} a restore accepts`,
    );
  const document = parseBackup(readFileSync(file, 'utf8'));
  if (typeof document === 'string') throw new UsageError(`${file} is not a Vanbay backup: ${document}`);
  return { document, size };
}

/** The file's bytes as they are, a chunk each time fetch asks for more: progress is what was taken. */
function uploadBody(file: string, onBytes: (sent: number) => void): ReadableStream<Uint8Array> {
  let handle: FileHandle | null = null;
  let sent = 0;
  return new ReadableStream<Uint8Array>({
    async pull(controller) {
      handle ??= await open(file, 'r');
      const buffer = Buffer.alloc(UPLOAD_CHUNK_BYTES);
      const { bytesRead } = await handle.read(buffer, 0, buffer.length, null);
      if (bytesRead === 0) {
        await handle.close();
        controller.close();
        return;
      }
      sent += bytesRead;
      onBytes(sent);
      controller.enqueue(new Uint8Array(buffer.buffer, buffer.byteOffset, bytesRead));
    },
    async cancel() {
      await handle?.close();
    },
  });
}

async function confirmRestore(deps: CliDeps, document: BackupDocument, server: string): Promise<void> {
  if (!deps.interactive || !deps.prompt)
    throw new UsageError(
      'restore replaces all of the business’s data: add --yes to go ahead (no terminal to ask on)',
    );
  const name = typeof document.business.name === 'string' ? document.business.name : document.business.slug;
  const answer = await deps.prompt.input({
    message: `Replace ALL data on ${server} with the backup of ${name} made ${document.createdAt}? Type "yes" to go on`,
  });
  if (answer.trim().toLowerCase() !== 'yes') throw new Error('restore cancelled: nothing was changed');
}

/** Sends FILE to the server, which replaces the business's data with it in one transaction. */
export async function runRestore(
  deps: CliDeps,
  file: string,
  options: z.infer<typeof RestoreOptionsSchema>,
): Promise<RestoreResult> {
  const { document, size } = readBackupFile(file);
  if (!options.yes) await confirmRestore(deps, document, createApi(deps, options.server).server);
  const shown = options.json ? null : progressOn(deps, 'sent', size);
  const response = await call(
    deps,
    options.server,
    `${BACKUP_RESTORE_PATH}${options.force ? '?force=true' : ''}`,
    {
      method: 'POST',
      headers: { 'content-type': BACKUP_CONTENT_TYPE, accept: 'application/json' },
      body: uploadBody(file, (sent) => shown?.update(sent)),
      duplex: 'half',
    },
  );
  shown?.done(size);
  const parsed = RestoreResultSchema.safeParse(await response.json().catch(() => undefined));
  if (!parsed.success)
    throw new ApiError(response.status, 'unexpected_answer', 'unexpected answer to the restore');
  return parsed.data;
}

const rowsIn = (tables: Record<string, number>) => Object.values(tables).reduce((sum, n) => sum + n, 0);

export async function backupAction(deps: CliDeps, file: string, raw: unknown, command: Command) {
  const options = OptionsSchema.parse({ ...command.optsWithGlobals(), ...(raw as object) });
  const summary = await runBackup(deps, file, options);
  if (options.json) {
    deps.stdout.write(`${JSON.stringify(summary)}\n`);
    return;
  }
  const tables = Object.keys(summary.tables).length;
  deps.stdout.write(
    `${theme.pass('backed up')} ${rowsIn(summary.tables)} rows in ${tables} tables to ${summary.file} (${formatBytes(summary.bytes)})\n`,
  );
}

export async function restoreAction(deps: CliDeps, file: string, raw: unknown, command: Command) {
  const options = RestoreOptionsSchema.parse({ ...command.optsWithGlobals(), ...(raw as object) });
  const result = await runRestore(deps, file, options);
  if (options.json) {
    deps.stdout.write(`${JSON.stringify(result)}\n`);
    return;
  }
  deps.stdout.write(
    `${theme.pass('restored')} ${result.business} from the backup of ${result.backupCreatedAt}: ` +
      `${rowsIn(result.tables)} rows, ${result.files} files\n`,
  );
  for (const [table, count] of Object.entries(result.tables))
    deps.stdout.write(`  ${table.padEnd(20)} ${String(count).padStart(7)}\n`);
}
