/**
 * Where `vanbay login` keeps its sessions: `$XDG_CONFIG_HOME/vanbay/sessions.json` (else
 * `~/.config/vanbay/`), mode 0600, one token per server so a laptop can talk to the van's server
 * and a test server without signing in again.
 */
import { chmodSync, existsSync, mkdirSync, readFileSync, renameSync, writeFileSync } from 'node:fs';
import { homedir } from 'node:os';
import path from 'node:path';
import { z } from 'zod';
import { SessionUserSchema } from '../../shared/api/auth';

const StoredSessionSchema = z.object({ token: z.string(), user: SessionUserSchema, signedInAt: z.string() });
const StoreSchema = z.object({ sessions: z.record(z.string(), StoredSessionSchema) });
export type StoredSession = z.infer<typeof StoredSessionSchema>;

export function configDir(env: NodeJS.ProcessEnv): string {
  const base = env.XDG_CONFIG_HOME || path.join(env.HOME || homedir(), '.config');
  return path.join(base, 'vanbay');
}

const storeFile = (env: NodeJS.ProcessEnv) => path.join(configDir(env), 'sessions.json');

function readStore(env: NodeJS.ProcessEnv): z.infer<typeof StoreSchema> {
  const file = storeFile(env);
  if (!existsSync(file)) return { sessions: {} };
  const parsed = StoreSchema.safeParse(JSON.parse(readFileSync(file, 'utf8')));
  // A damaged file is treated as signed out rather than a crash; the next login rewrites it.
  return parsed.success ? parsed.data : { sessions: {} };
}

function writeStore(env: NodeJS.ProcessEnv, store: z.infer<typeof StoreSchema>) {
  const dir = configDir(env);
  mkdirSync(dir, { recursive: true, mode: 0o700 });
  const file = storeFile(env);
  const temp = `${file}.${process.pid}.tmp`;
  writeFileSync(temp, `${JSON.stringify(store, null, 2)}\n`, { mode: 0o600 });
  chmodSync(temp, 0o600);
  renameSync(temp, file);
}

export function loadSession(env: NodeJS.ProcessEnv, server: string): StoredSession | null {
  return readStore(env).sessions[server] ?? null;
}

export function saveSession(env: NodeJS.ProcessEnv, server: string, session: StoredSession) {
  const store = readStore(env);
  store.sessions[server] = session;
  writeStore(env, store);
}

export function forgetSession(env: NodeJS.ProcessEnv, server: string): boolean {
  const store = readStore(env);
  if (!store.sessions[server]) return false;
  delete store.sessions[server];
  writeStore(env, store);
  return true;
}

/** CONTRACT.md: the token from `vanbay login`, or `VANBAY_TOKEN`; the environment wins when set. */
export function resolveToken(env: NodeJS.ProcessEnv, server: string): string | null {
  return env.VANBAY_TOKEN || loadSession(env, server)?.token || null;
}
