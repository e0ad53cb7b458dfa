import { Command } from 'commander';
import { QUANTITIES } from '../../shared/quantities';
import { JSON_HELP, lazy } from '../lib/define';
import type { CliDeps } from '../lib/deps';

const actions = () => import('../actions/reading');

export function readingCommand(deps: CliDeps) {
  const command = new Command('reading').description('measurements on a job');
  command
    .command('add')
    .description('record a reading, e.g. `vanbay reading add 12 pressure 43psi`; queued when offline')
    .argument('<job>', 'job number')
    .argument('<quantity>', QUANTITIES.join(', '))
    .argument('<value>', 'the value with its unit as read: 43psi, 3bar, 12.4V, 250mL')
    .option('--note <text>', 'a note to keep with it')
    .option('--json', JSON_HELP)
    .action(lazy(deps, async () => (await actions()).readingAddAction));
  return command;
}
