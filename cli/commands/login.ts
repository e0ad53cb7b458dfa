import { Command } from 'commander';
import { JSON_HELP, lazy } from '../lib/define';
import type { CliDeps } from '../lib/deps';

const actions = () => import('../actions/login');

export function loginCommand(deps: CliDeps) {
  return new Command('login')
    .description('sign in to a Vanbay server; the session is kept for later commands')
    .option('--email <email>', 'your sign-in e-mail (asked for when missing)')
    .option('--password <password>', 'your password (asked for when missing, without echo)')
    .option('--json', JSON_HELP)
    .action(lazy(deps, async () => (await actions()).loginAction));
}
