import { Command } from 'commander';
import { lazy } from '../lib/define';
import type { CliDeps } from '../lib/deps';

const actions = () => import('../actions/backup');

export function backupCommand(deps: CliDeps) {
  return new Command('backup')
    .description("download the business's whole data to FILE (owner only; keep the file safe)")
    .argument('<file>', 'where to write the backup (JSON)')
    .option('--json', 'print {file, bytes, tables} as JSON')
    .action(lazy(deps, async () => (await actions()).backupAction));
}

export function restoreCommand(deps: CliDeps) {
  return new Command('restore')
    .description("replace the business's whole data with a backup FILE (owner only)")
    .argument('<file>', 'a backup written by `vanbay backup`')
    .option('--yes', 'do not ask for confirmation')
    .option('--force', 'restore a backup of another business (another slug) onto this one')
    .option('--json', 'print the counts restored as JSON')
    .action(lazy(deps, async () => (await actions()).restoreAction));
}
