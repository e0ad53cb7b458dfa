import type { CliDeps } from '../../cli/lib/deps';

/** Fake deps for command-logic tests: captured output and a fetch of the test's choosing. */
export function fakeDeps(fetchImpl: typeof fetch, env: NodeJS.ProcessEnv = {}) {
  const out: string[] = [];
  const err: string[] = [];
  const deps: CliDeps = {
    fetch: fetchImpl,
    env,
    stdout: { write: (text) => void out.push(text) },
    stderr: { write: (text) => void err.push(text) },
  };
  return { deps, stdout: () => out.join(''), stderr: () => err.join('') };
}
