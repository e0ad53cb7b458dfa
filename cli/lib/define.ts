/**
 * What the command definitions in cli/commands/ share. Kept free of zod and the API schemas: every
 * definition is built for `vanbay --help`, which must start quickly (`npm run bench`, cli-help).
 */
import type { Command } from 'commander';
import type { CliDeps } from './deps';

/**
 * An action that loads its module (cli/actions/) on first use and hands it the deps and commander's
 * arguments. The single-file bundle keeps a module reached only through `await import()`
 * uninitialised until then, so zod and the schemas run only for the command that needs them.
 */
export function lazy<A extends unknown[]>(
  deps: CliDeps,
  load: () => Promise<(deps: CliDeps, ...args: A) => unknown>,
) {
  return async (...args: A) => {
    const action = await load();
    await action(deps, ...args);
  };
}

export const JSON_HELP = 'print the result as JSON';

/** A subcommand that prints data, so takes `--json`. */
export const sub = (parent: Command, name: string, description: string) =>
  parent.command(name).description(description).option('--json', JSON_HELP);
