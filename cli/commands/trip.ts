import { Command } from 'commander';
import { lazy, sub } from '../lib/define';
import type { CliDeps } from '../lib/deps';

const actions = () => import('../actions/trip');

export function tripCommand(deps: CliDeps) {
  const command = new Command('trip').description("the van's mileage log: start, end, add, list");
  sub(command, 'start', 'start a trip at the odometer now: --odometer N --to PLACE --purpose WHY [--job J]')
    .option('--odometer <n>', "the van's odometer now")
    .requiredOption('--to <place>', 'destination')
    .requiredOption('--purpose <why>', 'business purpose')
    .option('--from <place>', 'where from')
    .option('--job <id>', 'the job the trip is for')
    .option('--km', 'the odometer counts kilometres')
    .action(lazy(deps, async () => (await actions()).tripStartAction));
  sub(command, 'end', 'end the trip under way: --odometer N')
    .option('--odometer <n>', "the van's odometer now")
    .action(lazy(deps, async () => (await actions()).tripEndAction));
  sub(command, 'add', 'log a trip after the fact: --start N --end N --to PLACE --purpose WHY [--date D]')
    .requiredOption('--start <n>', 'odometer at the start')
    .requiredOption('--end <n>', 'odometer at the end')
    .requiredOption('--to <place>', 'destination')
    .requiredOption('--purpose <why>', 'business purpose')
    .option('--date <yyyy-mm-dd>', 'the day of the trip (default today)')
    .option('--from <place>', 'where from')
    .option('--job <id>', 'the job the trip was for')
    .option('--km', 'the odometer counts kilometres')
    .action(lazy(deps, async () => (await actions()).tripAddAction));
  sub(command, 'list', 'trips, newest first')
    .option('--from <yyyy-mm-dd>', 'on or after')
    .option('--to <yyyy-mm-dd>', 'on or before')
    .action(lazy(deps, async () => (await actions()).tripListAction));
  return command;
}
