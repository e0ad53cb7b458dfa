import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runCli } from '../../cli/program';
import { OutboxItemSchema } from '../../shared/api/outbox';
import { listeningApi, type TestApi } from '../helpers/api';
import { fakeDeps } from '../helpers/cli';
import { freshInvoice } from '../server/access/money';

let api: TestApi;
let url: string;
beforeAll(async () => {
  const listening = await listeningApi();
  api = listening;
  url = listening.url;
});
afterAll(() => api.close());

async function vanbay(...argv: string[]) {
  const io = fakeDeps(fetch, {
    VANBAY_URL: url,
    XDG_CONFIG_HOME: mkdtempSync(path.join(tmpdir(), 'vanbay-config-')),
    VANBAY_TOKEN: api.tokens.owner,
  });
  const code = await runCli(argv, io.deps);
  return { code, stdout: io.stdout(), stderr: io.stderr() };
}

describe('vanbay invoice send', () => {
  it('mails the invoice with its PDF to the fake SMTP server and prints the outbox entry', async () => {
    const invoice = await freshInvoice(api);
    const before = api.mail!.messages.length;
    const result = await vanbay('invoice', 'send', String(invoice.id), '--json');
    expect(result.code, result.stderr).toBe(0);
    const mail = OutboxItemSchema.parse(JSON.parse(result.stdout));
    expect(mail).toMatchObject({
      status: 'sent',
      to: 'jules@example.test',
      attachments: [{ filename: `invoice-${invoice.number}.pdf` }],
    });
    expect(api.mail!.messages).toHaveLength(before + 1);
    const [pdf] = api.mail!.messages.at(-1)!.attachments;
    // ISO 32000-1 §7.5.2: a PDF begins "%PDF-".
    expect(pdf!.content.subarray(0, 5).toString('latin1')).toBe('%PDF-');

    const twice = await vanbay('invoice', 'send', String(invoice.id), '--json');
    expect(twice.code).toBe(1);
    expect(twice.stdout).toBe('');
    expect(twice.stderr.trim().split('\n')).toHaveLength(1);
    expect(api.mail!.messages).toHaveLength(before + 1);

    const again = await vanbay('invoice', 'send', String(invoice.id), '--again', '--json');
    expect(again.code, again.stderr).toBe(0);
    expect(api.mail!.messages).toHaveLength(before + 2);
  });

  it('refuses an invoice that is not a number with exit 2', async () => {
    const result = await vanbay('invoice', 'send', 'INV-7');
    expect(result.code).toBe(2);
    expect(result.stderr.trim().split('\n')).toHaveLength(1);
  });
});
