import { Command } from 'commander';
import { JSON_HELP, lazy } from '../lib/define';
import type { CliDeps } from '../lib/deps';

const actions = () => import('../actions/health');

export function healthCommand(deps: CliDeps) {
  return new Command('health')
    .description('check that the Vanbay server and its database answer')
    .option('--json', JSON_HELP)
    .action(lazy(deps, async () => (await actions()).healthAction));
}
