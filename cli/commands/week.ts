import { Command } from 'commander';
import { lazy } from '../lib/define';
import type { CliDeps } from '../lib/deps';

const actions = () => import('../actions/week');

export function weekCommand(deps: CliDeps) {
  return new Command('week')
    .description("the week's summary: jobs, hours, revenue, unpaid, miles, checks, machines due")
    .option('--start <date>', 'first day of the week, YYYY-MM-DD (default: this Monday)')
    .option('--json', 'print the same object as GET /api/reports/week')
    .action(lazy(deps, async () => (await actions()).weekAction));
}
