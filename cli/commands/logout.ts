import { Command } from 'commander';
import { JSON_HELP, lazy } from '../lib/define';
import type { CliDeps } from '../lib/deps';

const actions = () => import('../actions/logout');

export function logoutCommand(deps: CliDeps) {
  return new Command('logout')
    .description('sign out of the server and forget the session')
    .option('--json', JSON_HELP)
    .action(lazy(deps, async () => (await actions()).logoutAction));
}
