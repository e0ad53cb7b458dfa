import { Command } from 'commander';
import { JSON_HELP, lazy } from '../lib/define';
import type { CliDeps } from '../lib/deps';

const actions = () => import('../actions/sync');

export function syncCommand(deps: CliDeps) {
  return new Command('sync')
    .description('send the writes queued while the server was unreachable, each exactly once')
    .option('--json', JSON_HELP)
    .action(lazy(deps, async () => (await actions()).syncAction));
}

export function statusCommand(deps: CliDeps) {
  return new Command('status')
    .description('show what is waiting in the offline queue')
    .option('--json', JSON_HELP)
    .action(lazy(deps, async () => (await actions()).statusAction));
}
