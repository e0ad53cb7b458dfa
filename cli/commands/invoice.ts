import { Command } from 'commander';
import { JSON_HELP, lazy } from '../lib/define';
import type { CliDeps } from '../lib/deps';

const actions = () => import('../actions/invoice');

export function invoiceCommand(deps: CliDeps) {
  const command = new Command('invoice').description('invoices: create from a complete job, list, send');
  command
    .command('create')
    .description("invoice a complete job from its line items, at the business's tax settings")
    .argument('<job>', 'job number')
    .option('--json', JSON_HELP)
    .action(lazy(deps, async () => (await actions()).invoiceCreateAction));
  command
    .command('list')
    .description('invoices, newest first')
    .option('--unpaid', 'only those with a balance left')
    .option('--overdue', 'only those past their due date')
    .option('--json', JSON_HELP)
    .action(lazy(deps, async () => (await actions()).invoiceListAction));
  command
    .command('send')
    .description('e-mail an invoice with its PDF to the customer (once; --again to send it once more)')
    .argument('<invoice>', 'invoice id (the `id` in `invoice list --json`)')
    .option('--again', 'send an invoice that was already sent')
    .option('--json', 'print the outbox entry as JSON')
    .action(lazy(deps, async () => (await actions()).invoiceSendAction));
  return command;
}
