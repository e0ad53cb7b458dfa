/** What a command needs from the outside world, so tests can hand it fakes. */
export interface Output {
  write(text: string): void;
}

export interface CliDeps {
  fetch: typeof fetch;
  env: NodeJS.ProcessEnv;
  stdout: Output;
  stderr: Output;
}

export const DEFAULT_SERVER = 'http://localhost:5180';

/** CONTRACT.md: `--server URL`, else VANBAY_URL, else http://localhost:5180. */
export function resolveServer(flag: string | undefined, env: NodeJS.ProcessEnv): string {
  return (flag ?? env.VANBAY_URL ?? DEFAULT_SERVER).replace(/\/+$/, '');
}

/** Bad input (exit 2): the message is one line for the person at the keyboard. */
export class UsageError extends Error {
  override name = 'UsageError';
}
