import { Command } from 'commander';
import { lazy, sub } from '../lib/define';
import type { CliDeps } from '../lib/deps';

const actions = () => import('../actions/service');

export function serviceCommand(deps: CliDeps) {
  const command = new Command('service').description(
    "a machine's service intervals: where each stands, and recording one done",
  );
  sub(command, 'list', "MACHINE's service intervals and where each stands today")
    .argument('<machine>', 'machine id')
    .action(lazy(deps, async () => (await actions()).serviceListAction));
  sub(command, 'done', 'record INTERVAL on MACHINE done: [--on YYYY-MM-DD] [--meter N]')
    .argument('<machine>', 'machine id')
    .argument('<interval>', 'interval id (from `vanbay service list`)')
    .option('--on <yyyy-mm-dd>', 'the day it was done (default today)')
    .option('--meter <n>', "the machine's meter then, in its own unit (default: left as last recorded)")
    .action(lazy(deps, async () => (await actions()).serviceDoneAction));
  return command;
}
