import { Command } from 'commander';
import { JSON_HELP, lazy } from '../lib/define';
import type { CliDeps } from '../lib/deps';

const actions = () => import('../actions/check');

export function checkCommand(deps: CliDeps) {
  const command = new Command('check').description('guided checks at the roadside');
  command
    .command('run')
    .description('walk a guided check step by step: fuel, battery or compression')
    .argument('<job>', 'job number')
    .argument('<procedure>', 'fuel, battery or compression')
    .option('--json', 'print the saved result as JSON')
    .action(lazy(deps, async () => (await actions()).checkRunAction));
  command
    .command('resume')
    .description('carry on with a paused check: `vanbay check resume JOB CHECK`')
    .argument('<job>', 'job number')
    .argument('<check>', 'check number, as `vanbay check run` printed it')
    .option('--json', JSON_HELP)
    .action(lazy(deps, async () => (await actions()).checkResumeAction));
  return command;
}
