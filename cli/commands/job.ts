import { Command } from 'commander';
import { lazy, sub } from '../lib/define';
import type { CliDeps } from '../lib/deps';

const actions = () => import('../actions/job');

export function jobCommand(deps: CliDeps) {
  const command = new Command('job').description('work orders: new, list, show, status, note');
  sub(command, 'list', 'jobs, newest first: --today, --week, --status, --customer, --machine')
    .option('--status <list>', 'one or several, comma-separated (booked,on_site,…)')
    .option('--today', "today's jobs")
    .option('--week', "this week's jobs (Monday to Sunday)")
    .option('--customer <id>', 'one customer')
    .option('--machine <id>', 'one machine')
    .option('--limit <n>', 'at most this many (default 50)')
    .action(lazy(deps, async () => (await actions()).jobListAction));
  sub(command, 'show', 'one job with its timeline')
    .argument('<job>')
    .action(lazy(deps, async () => (await actions()).jobShowAction));
  sub(command, 'new', 'a new job: --customer NAME|ID --machine ID|TEXT --complaint "…"')
    .option('--customer <customer>', 'customer number or name')
    .option('--machine <machine>', 'machine number, or make/model/VIN to find it')
    .option('--complaint <text>', "what's wrong, in the rider's words")
    .option('--location <text>', 'where the work is')
    .option('--meter <reading>', "odometer or hours at this visit, in the machine's unit")
    .action(lazy(deps, async () => (await actions()).jobNewAction));
  sub(
    command,
    'status',
    'move a job on: on_site, diagnosing, awaiting_approval, repairing, complete, cancelled',
  )
    .argument('<job>')
    .argument('<status>')
    .option('--note <text>', 'why, for the timeline')
    .action(lazy(deps, async () => (await actions()).jobStatusAction));
  sub(command, 'note', 'add a note to the job timeline (queued when offline)')
    .argument('<job>')
    .argument('<text...>')
    .action(lazy(deps, async () => (await actions()).jobNoteAction));
  return command;
}
