import { Command } from 'commander';
import { JSON_HELP, lazy } from '../lib/define';
import type { CliDeps } from '../lib/deps';

const actions = () => import('../actions/whoami');

export function whoamiCommand(deps: CliDeps) {
  return new Command('whoami')
    .description('show who you are signed in as')
    .option('--json', JSON_HELP)
    .action(lazy(deps, async () => (await actions()).whoamiAction));
}
