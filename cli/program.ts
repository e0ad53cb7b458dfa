/**
 * The commands as commander sees them (names, arguments, options, help text), eagerly; each
 * action's code (zod, the API schemas, the engine) is imported only when that action runs. The
 * single-file bundle keeps a dynamically imported module uninitialised until it is asked for, so
 * `vanbay --help` and `vanbay calc …` start without initialising zod or any schema.
 */
import { Command, CommanderError } from 'commander';
import { FUELS } from '../shared/evaluators/mixture';
import { GENERIC_MIN_FLOW_LPH } from '../shared/evaluators/flow-volume';
import { QUANTITIES } from '../shared/quantities';
import { UsageError, type CliDeps } from './lib/deps';
import { theme } from './ui/theme';

declare const __VANBAY_VERSION__: string | undefined;
const VERSION = typeof __VANBAY_VERSION__ === 'string' ? __VANBAY_VERSION__ : '0.0.0-dev';

/** An action that loads its module on first use and hands it the deps and commander's arguments. */
function lazy<A extends unknown[]>(
  deps: CliDeps,
  load: () => Promise<(deps: CliDeps, ...args: A) => unknown>,
) {
  return async (...args: A) => {
    const action = await load();
    await action(deps, ...args);
  };
}

const JSON_HELP = 'print the result as JSON';
/** A subcommand that prints data, so takes `--json`. */
const sub = (parent: Command, name: string, description: string) =>
  parent.command(name).description(description).option('--json', JSON_HELP);

const whoami = () => import('./commands/whoami');
const health = () => import('./commands/health');
const login = () => import('./commands/login');
const logout = () => import('./commands/logout');
const job = () => import('./commands/job');
const reading = () => import('./commands/reading');
const check = () => import('./commands/check');
const trip = () => import('./commands/trip');
const invoice = () => import('./commands/invoice');
const sync = () => import('./commands/sync');
const week = () => import('./commands/week');
const backup = () => import('./commands/backup');
const calc = () => import('./commands/calc');

export function healthCommand(deps: CliDeps) {
  return new Command('health')
    .description('check that the Vanbay server and its database answer')
    .option('--json', JSON_HELP)
    .action(lazy(deps, async () => (await health()).healthAction));
}

export function loginCommand(deps: CliDeps) {
  return new Command('login')
    .description('sign in to a Vanbay server; the session is kept for later commands')
    .option('--email <email>', 'your sign-in e-mail (asked for when missing)')
    .option('--password <password>', 'your password (asked for when missing, without echo)')
    .option('--json', JSON_HELP)
    .action(lazy(deps, async () => (await login()).loginAction));
}

export function logoutCommand(deps: CliDeps) {
  return new Command('logout')
    .description('sign out of the server and forget the session')
    .option('--json', JSON_HELP)
    .action(lazy(deps, async () => (await logout()).logoutAction));
}

export function whoamiCommand(deps: CliDeps) {
  return new Command('whoami')
    .description('show who you are signed in as')
    .option('--json', JSON_HELP)
    .action(lazy(deps, async () => (await whoami()).whoamiAction));
}

export function jobCommand(deps: CliDeps) {
  const command = new Command('job').description('work orders: new, list, show, status, note');
  sub(command, 'list', 'jobs, newest first: --today, --week, --status, --customer, --machine')
    .option('--status <list>', 'one or several, comma-separated (booked,on_site,…)')
    .option('--today', "today's jobs")
    .option('--week', "this week's jobs (Monday to Sunday)")
    .option('--customer <id>', 'one customer')
    .option('--machine <id>', 'one machine')
    .option('--limit <n>', 'at most this many (default 50)')
    .action(lazy(deps, async () => (await job()).jobListAction));
  sub(command, 'show', 'one job with its timeline')
    .argument('<job>')
    .action(lazy(deps, async () => (await job()).jobShowAction));
  sub(command, 'new', 'a new job: --customer NAME|ID --machine ID|TEXT --complaint "…"')
    .option('--customer <customer>', 'customer number or name')
    .option('--machine <machine>', 'machine number, or make/model/VIN to find it')
    .option('--complaint <text>', "what's wrong, in the rider's words")
    .option('--location <text>', 'where the work is')
    .option('--meter <reading>', "odometer or hours at this visit, in the machine's unit")
    .action(lazy(deps, async () => (await job()).jobNewAction));
  sub(
    command,
    'status',
    'move a job on: on_site, diagnosing, awaiting_approval, repairing, complete, cancelled',
  )
    .argument('<job>')
    .argument('<status>')
    .option('--note <text>', 'why, for the timeline')
    .action(lazy(deps, async () => (await job()).jobStatusAction));
  sub(command, 'note', 'add a note to the job timeline (queued when offline)')
    .argument('<job>')
    .argument('<text...>')
    .action(lazy(deps, async () => (await job()).jobNoteAction));
  return command;
}

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
    .action(lazy(deps, async () => (await reading()).readingAddAction));
  return command;
}

export function checkCommand(deps: CliDeps) {
  const command = new Command('check').description('guided checks at the roadside');
  command
    .command('run')
    .description('walk a guided check step by step: fuel, battery or compression')
    .argument('<job>', 'job number')
    .argument('<procedure>', 'fuel, battery or compression')
    .option('--json', 'print the saved result as JSON')
    .action(lazy(deps, async () => (await check()).checkRunAction));
  command
    .command('resume')
    .description('carry on with a paused check: `vanbay check resume JOB CHECK`')
    .argument('<job>', 'job number')
    .argument('<check>', 'check number, as `vanbay check run` printed it')
    .option('--json', JSON_HELP)
    .action(lazy(deps, async () => (await check()).checkResumeAction));
  return command;
}

export function tripCommand(deps: CliDeps) {
  const command = new Command('trip').description("the van's mileage log: start, end, add, list");
  sub(command, 'start', 'start a trip at the odometer now: --odometer N --to PLACE --purpose WHY [--job J]')
    .option('--odometer <n>', "the van's odometer now")
    .requiredOption('--to <place>', 'destination')
    .requiredOption('--purpose <why>', 'business purpose')
    .option('--from <place>', 'where from')
    .option('--job <id>', 'the job the trip is for')
    .option('--km', 'the odometer counts kilometres')
    .action(lazy(deps, async () => (await trip()).tripStartAction));
  sub(command, 'end', 'end the trip under way: --odometer N')
    .option('--odometer <n>', "the van's odometer now")
    .action(lazy(deps, async () => (await trip()).tripEndAction));
  sub(command, 'add', 'log a trip after the fact: --start N --end N --to PLACE --purpose WHY [--date D]')
    .requiredOption('--start <n>', 'odometer at the start')
    .requiredOption('--end <n>', 'odometer at the end')
    .requiredOption('--to <place>', 'destination')
    .requiredOption('--purpose <why>', 'business purpose')
    .option('--date <yyyy-mm-dd>', 'the day of the trip (default today)')
    .option('--from <place>', 'where from')
    .option('--job <id>', 'the job the trip was for')
    .option('--km', 'the odometer counts kilometres')
    .action(lazy(deps, async () => (await trip()).tripAddAction));
  sub(command, 'list', 'trips, newest first')
    .option('--from <yyyy-mm-dd>', 'on or after')
    .option('--to <yyyy-mm-dd>', 'on or before')
    .action(lazy(deps, async () => (await trip()).tripListAction));
  return command;
}

export function invoiceCommand(deps: CliDeps) {
  const command = new Command('invoice').description('invoices: create from a complete job, list, send');
  command
    .command('create')
    .description("invoice a complete job from its line items, at the business's tax settings")
    .argument('<job>', 'job number')
    .option('--json', JSON_HELP)
    .action(lazy(deps, async () => (await invoice()).invoiceCreateAction));
  command
    .command('list')
    .description('invoices, newest first')
    .option('--unpaid', 'only those with a balance left')
    .option('--overdue', 'only those past their due date')
    .option('--json', JSON_HELP)
    .action(lazy(deps, async () => (await invoice()).invoiceListAction));
  command
    .command('send')
    .description('e-mail an invoice with its PDF to the customer (once; --again to send it once more)')
    .argument('<invoice>', 'invoice id (the `id` in `invoice list --json`)')
    .option('--again', 'send an invoice that was already sent')
    .option('--json', 'print the outbox entry as JSON')
    .action(lazy(deps, async () => (await invoice()).invoiceSendAction));
  return command;
}

export function syncCommand(deps: CliDeps) {
  return new Command('sync')
    .description('send the writes queued while the server was unreachable, each exactly once')
    .option('--json', JSON_HELP)
    .action(lazy(deps, async () => (await sync()).syncAction));
}

export function statusCommand(deps: CliDeps) {
  return new Command('status')
    .description('show what is waiting in the offline queue')
    .option('--json', JSON_HELP)
    .action(lazy(deps, async () => (await sync()).statusAction));
}

export function weekCommand(deps: CliDeps) {
  return new Command('week')
    .description("the week's summary: jobs, hours, revenue, unpaid, miles, checks, machines due")
    .option('--start <date>', 'first day of the week, YYYY-MM-DD (default: this Monday)')
    .option('--json', 'print the same object as GET /api/reports/week')
    .action(lazy(deps, async () => (await week()).weekAction));
}

export function backupCommand(deps: CliDeps) {
  return new Command('backup')
    .description("download the business's whole data to FILE (owner only; keep the file safe)")
    .argument('<file>', 'where to write the backup (JSON)')
    .option('--json', 'print {file, bytes, tables} as JSON')
    .action(lazy(deps, async () => (await backup()).backupAction));
}

export function restoreCommand(deps: CliDeps) {
  return new Command('restore')
    .description("replace the business's whole data with a backup FILE (owner only)")
    .argument('<file>', 'a backup written by `vanbay backup`')
    .option('--yes', 'do not ask for confirmation')
    .option('--force', 'restore a backup of another business (another slug) onto this one')
    .option('--json', 'print the counts restored as JSON')
    .action(lazy(deps, async () => (await backup()).restoreAction));
}

/** The offline calculators (CONTRACT.md); their module imports no zod, so they start quickly too. */
export function calcCommand(deps: CliDeps) {
  const command = new Command('calc').description(
    'offline calculators: units, battery, drop, lambda, hold, flow, compression, VIN, mileage',
  );
  sub(
    command,
    'convert',
    'convert VALUE from one unit to another (psi kPa bar, mL L gal floz, L/h mL/min gal/h, mi km, F C)',
  )
    .argument('<value>')
    .argument('<from>')
    .argument('<to>')
    .action(lazy(deps, async () => (await calc()).calcConvertAction));
  sub(command, 'battery', 'state of charge from the resting voltage')
    .argument('<volts>')
    .option('--type <type>', 'flooded, agm or lithium', 'flooded')
    .action(lazy(deps, async () => (await calc()).calcBatteryAction));
  sub(command, 'drop', 'voltage lost between the supply and the load')
    .argument('<supplyVolts>')
    .argument('<loadVolts>')
    .option('--max <volts>', 'largest acceptable drop (default 0.5 V)')
    .action(lazy(deps, async () => (await calc()).calcDropAction));
  sub(command, 'lambda', 'lambda and mixture from an air-fuel ratio')
    .argument('<afr>')
    .option('--fuel <fuel>', FUELS.join(', '), 'gasoline')
    .action(lazy(deps, async () => (await calc()).calcLambdaAction));
  sub(command, 'hold', 'static pressure hold: drop after the 30 s settling window')
    .requiredOption('--points <list>', 'SEC:PSI,SEC:PSI,… since the pump stopped')
    .requiredOption('--max-drop <psi>', 'largest acceptable drop in psi')
    .requiredOption('--minutes <m>', 'length of the hold test')
    .action(lazy(deps, async () => (await calc()).calcHoldAction));
  sub(command, 'flow', 'flow volume from fuel collected in a timed run')
    .requiredOption('--ml <ml>', 'fuel collected, mL')
    .requiredOption('--seconds <s>', 'time the pump ran')
    .option('--min-lph <n>', `minimum from the service manual (default ${GENERIC_MIN_FLOW_LPH} L/h, generic)`)
    .action(lazy(deps, async () => (await calc()).calcFlowAction));
  sub(command, 'compression', 'spread across cylinders: (highest − lowest) / highest')
    .argument('<psi...>')
    .action(lazy(deps, async () => (await calc()).calcCompressionAction));
  sub(command, 'vin', 'check digit (49 CFR 565.15) and possible model years')
    .argument('<vin>')
    .action(lazy(deps, async () => (await calc()).calcVinAction));
  sub(command, 'mileage', 'mileage deduction at the standard rate for the tax year')
    .argument('<miles>')
    .requiredOption('--year <yyyy>', 'tax year')
    .option('--rate <cents>', 'cents per mile, instead of the published rate')
    .action(lazy(deps, async () => (await calc()).calcMileageAction));
  return command;
}

export function buildProgram(deps: CliDeps) {
  const program = new Command('vanbay')
    .description('Vanbay: jobs, readings and checks from the van')
    .version(VERSION)
    .option('--server <url>', 'Vanbay server (default: $VANBAY_URL or http://localhost:5180)')
    .showHelpAfterError(false)
    .configureOutput({
      writeOut: (text) => deps.stdout.write(text),
      writeErr: (text) => deps.stderr.write(text),
      outputError: () => {}, // printed once, in one line, by runCli
    })
    .exitOverride();
  for (const command of [
    healthCommand(deps),
    loginCommand(deps),
    logoutCommand(deps),
    whoamiCommand(deps),
    jobCommand(deps),
    readingCommand(deps),
    checkCommand(deps),
    tripCommand(deps),
    invoiceCommand(deps),
    syncCommand(deps),
    statusCommand(deps),
    weekCommand(deps),
    backupCommand(deps),
    restoreCommand(deps),
    calcCommand(deps),
  ]) {
    program.addCommand(command);
    inheritSettings(command, program);
  }
  return program;
}

/**
 * addCommand does not pass the parent's output and exit settings down; without them a
 * subcommand's bad option would print commander's own text and exit 1 instead of 2.
 */
function inheritSettings(command: Command, parent: Command) {
  command.copyInheritedSettings(parent);
  for (const child of command.commands) inheritSettings(child, command);
}

/** Runs the CLI and returns its exit code: 0 done, 1 the server said no, 2 bad input. */
export async function runCli(argv: string[], deps: CliDeps): Promise<number> {
  process.exitCode = undefined;
  const program = buildProgram(deps);
  try {
    await program.parseAsync(argv, { from: 'user' });
    return typeof process.exitCode === 'number' ? process.exitCode : 0;
  } catch (error) {
    if (error instanceof CommanderError) {
      // --help and --version end through here with code 0.
      if (error.exitCode === 0) return 0;
      deps.stderr.write(`${theme.error(oneLine(error.message.replace(/^error: /, '')))}\n`);
      return 2;
    }
    if (error instanceof Error && error.name === 'ExitPromptError') {
      // Ctrl-C at a prompt: quietly, with the shell's code for an interrupt.
      return 130;
    }
    if (error instanceof UsageError || (error instanceof Error && error.name === 'ZodError')) {
      deps.stderr.write(`${theme.error(oneLine(error.message))}\n`);
      return 2;
    }
    deps.stderr.write(`${theme.error(oneLine(error instanceof Error ? error.message : String(error)))}\n`);
    return 1;
  }
}

const oneLine = (text: string) => text.split('\n')[0]!.trim();
