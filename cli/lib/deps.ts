/** What a command needs from the outside world, so tests can hand it fakes. */
export interface Output {
  write(text: string): void;
}

/** The questions a command may ask when a flag is missing and a person is at the keyboard. */
export interface Prompter {
  input(options: { message: string; default?: string }): Promise<string>;
  password(options: { message: string }): Promise<string>;
  /** Search-as-you-type over choices the `source` finds for what has been typed so far. */
  search?<T>(options: {
    message: string;
    source: (term: string | undefined) => Promise<{ name: string; value: T }[]>;
  }): Promise<T>;
}

export interface CliDeps {
  fetch: typeof fetch;
  env: NodeJS.ProcessEnv;
  stdout: Output;
  stderr: Output;
  /** True when stdin and stdout are a terminal: only then may a command prompt. */
  interactive?: boolean;
  prompt?: Prompter;
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
