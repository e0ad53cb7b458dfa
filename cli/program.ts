/**
 * The program: global options, the commands from cli/commands/ and the exit codes. A command's
 * definition (names, arguments, options, help text) is built eagerly; its action's code (zod, the
 * API schemas, the engine) lives in cli/actions/ and is imported only when that action runs, so
 * `vanbay --help` and `vanbay calc …` start without initialising zod or any schema.
 */
import { Command, CommanderError } from 'commander';
import { backupCommand, restoreCommand } from './commands/backup';
import { calcCommand } from './commands/calc';
import { checkCommand } from './commands/check';
import { healthCommand } from './commands/health';
import { invoiceCommand } from './commands/invoice';
import { jobCommand } from './commands/job';
import { loginCommand } from './commands/login';
import { logoutCommand } from './commands/logout';
import { readingCommand } from './commands/reading';
import { serviceCommand } from './commands/service';
import { statusCommand, syncCommand } from './commands/sync';
import { tripCommand } from './commands/trip';
import { weekCommand } from './commands/week';
import { whoamiCommand } from './commands/whoami';
import { UsageError, type CliDeps } from './lib/deps';
import { theme } from './ui/theme';

declare const __VANBAY_VERSION__: string | undefined;
const VERSION = typeof __VANBAY_VERSION__ === 'string' ? __VANBAY_VERSION__ : '0.0.0-dev';

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
    serviceCommand(deps),
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
