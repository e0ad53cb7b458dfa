/**
 * Card payments end to end: the real `stripe` SDK against the local fake payment service on
 * loopback, one app listening so the fake's signed webhooks reach it. Links, payment, refunds,
 * redelivery and bad signatures; and an invoice mailed with its card link on the PDF.
 */
import { randomBytes } from 'node:crypto';
import { mkdtempSync } from 'node:fs';
import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { and, count, eq } from 'drizzle-orm';
import { getDocument } from 'pdfjs-dist/legacy/build/pdf.mjs';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runCli } from '../../cli/program';
import { createApp } from '../../server/app';
import { signSession } from '../../server/auth/tokens';
import * as t from '../../server/db/schema';
import { demoUsers } from '../../server/db/seed-data';
import { startFakeSmtp, type FakeSmtp } from '../../server/mail/fake-smtp';
import { createMailer, type Mailer } from '../../server/mail/mailer';
import {
  signatureHeader,
  startFakePaymentServer,
  type FakePaymentServer,
} from '../../server/payments/fake-payment-server';
import { createStripeProvider, METADATA } from '../../server/payments/stripe-provider';
import { InvoiceDetailSchema, PaymentListSchema } from '../../shared/api/invoices';
import {
  InvoiceSentSchema,
  PAYMENT_WEBHOOK_PATH,
  PaymentLinkSchema,
  WebhookReceiptSchema,
  invoicePaymentLinkPath,
  type PaymentLink,
} from '../../shared/api/payments';
import { invoiceTotals } from '../../shared/money';
import type { Role } from '../../shared/api/users';
import { as, type TestApi } from '../helpers/api';
import { fakeDeps } from '../helpers/cli';
import { cloneDatabase, tempUploadsDir } from '../helpers/db';
import { SEED_TODAY } from '../helpers/fixtures';
import { DEFAULT_LINES, freshInvoice } from './access/money';

let api: TestApi;
let pay: FakePaymentServer;
let smtp: FakeSmtp;
let mailer: Mailer;
let server: Server;
let secret: Uint8Array;

const successUrl = (id: number) => `http://127.0.0.1:5180/invoices/${id}`;

beforeAll(async () => {
  const database = await cloneDatabase('seeded');
  const clock = {
    now: new Date(SEED_TODAY),
    set(date: Date) {
      this.now = date;
    },
  };
  secret = new Uint8Array(randomBytes(32));
  [smtp, pay] = await Promise.all([startFakeSmtp(), startFakePaymentServer()]);
  mailer = createMailer({ host: smtp.host, port: smtp.port });
  const payments = createStripeProvider({
    secretKey: pay.apiKey,
    webhookSecret: pay.webhookSecret,
    apiBase: pay.url,
    successUrl,
  });
  const app = createApp({
    db: database.db,
    clock: () => clock.now,
    uploadsDir: tempUploadsDir(),
    secret,
    mailer,
    payments,
  });
  server = app.listen(0, '127.0.0.1');
  await new Promise((resolve) => server.once('listening', resolve));
  pay.webhookUrl = `http://127.0.0.1:${(server.address() as AddressInfo).port}${PAYMENT_WEBHOOK_PATH}`;
  const tokens = {} as Record<Role, string>;
  const users = await database.db.select().from(t.users);
  for (const user of demoUsers) {
    tokens[user.role] = (
      await signSession(
        secret,
        users.find((u) => u.email === user.email)!,
        clock.now,
      )
    ).token;
  }
  api = { database, app, tokens, clock, mail: smtp, close: async () => {} };
});

afterAll(async () => {
  await new Promise((resolve) => server.close(resolve));
  mailer.close();
  await Promise.all([smtp.close(), pay.close()]);
  await api.database.close();
});

const db = () => api.database.db;
const owner = () => as(api, 'owner');

async function link(invoiceId: number, body: object = {}, status = 201): Promise<PaymentLink> {
  const response = await request(api.app).post(invoicePaymentLinkPath(invoiceId)).set(owner()).send(body);
  expect(response.status, JSON.stringify(response.body)).toBe(status);
  return PaymentLinkSchema.parse(response.body);
}
async function invoice(id: number) {
  return InvoiceDetailSchema.parse(
    (await request(api.app).get(`/api/invoices/${id}`).set(owner()).expect(200)).body,
  );
}
async function invoiceRow(id: number) {
  const [row] = await db().select().from(t.invoices).where(eq(t.invoices.id, id));
  return row!;
}
async function jobStatus(jobId: number) {
  const [row] = await db().select({ status: t.jobs.status }).from(t.jobs).where(eq(t.jobs.id, jobId));
  return row!.status;
}
async function paymentsOf(invoiceId: number) {
  return db().select().from(t.payments).where(eq(t.payments.invoiceId, invoiceId)).orderBy(t.payments.id);
}
async function seenEvents(eventId: string) {
  const [row] = await db()
    .select({ n: count() })
    .from(t.webhookEvents)
    .where(eq(t.webhookEvents.eventId, eventId));
  return row!.n;
}
const receipt = (body: string) => WebhookReceiptSchema.parse(JSON.parse(body));
const cash = (invoiceId: number, amountCents: number) =>
  request(api.app)
    .post(`/api/invoices/${invoiceId}/payments`)
    .set(owner())
    .send({ method: 'cash', amountCents })
    .expect(201);

/** Posts a webhook body exactly as given, with the given Stripe-Signature header (or none). */
function postWebhook(payload: string, header?: string) {
  const call = request(api.app).post(PAYMENT_WEBHOOK_PATH).set('Content-Type', 'application/json');
  return (header === undefined ? call : call.set('Stripe-Signature', header)).send(payload);
}

/** A checkout.session.completed event in the service's shape, for an invoice of ours. */
function completedEvent(target: { id: number; totalCents: number }, businessId: number) {
  const metadata = { [METADATA.businessId]: String(businessId), [METADATA.invoiceId]: String(target.id) };
  return {
    id: `evt_test_${randomBytes(8).toString('hex')}`,
    object: 'event',
    api_version: '2026-10-28.endive',
    created: Math.floor(Date.now() / 1000),
    livemode: false,
    pending_webhooks: 1,
    request: { id: null, idempotency_key: null },
    type: 'checkout.session.completed',
    data: {
      object: {
        id: `cs_test_${randomBytes(8).toString('hex')}`,
        object: 'checkout.session',
        amount_total: target.totalCents,
        currency: 'usd',
        metadata,
        mode: 'payment',
        payment_intent: `pi_test_${randomBytes(8).toString('hex')}`,
        payment_status: 'paid',
        status: 'complete',
      },
    },
  };
}

describe('a card link on an invoice', () => {
  it('is a checkout at the service for the balance, totalled by the shared money code, and reused while open', async () => {
    const target = await freshInvoice(api);
    // Hand arithmetic (as in invoices.test.ts): $142.50 labour + $236.25 part + 6.25 % of $236.25
    // = $14.77 (SSUTA §324 half up) → $393.52; the shared money code must agree.
    const expected = invoiceTotals(DEFAULT_LINES, 62_500, 'per_invoice');
    expect(expected.totalCents).toBe(39_352);
    expect(target.totalCents).toBe(expected.totalCents);

    const sessionsBefore = pay.sessions.size;
    const first = await link(target.id);
    expect(first).toMatchObject({
      invoiceId: target.id,
      amountCents: 39_352,
      currency: 'USD',
      created: true,
    });
    expect(first.url).toBe(`${pay.url}/pay/${first.sessionId}`);
    const session = pay.sessions.get(first.sessionId)!;
    expect(session).toMatchObject({
      amount_total: 39_352,
      currency: 'usd',
      status: 'open',
      customer_email: 'jules@example.test',
      success_url: successUrl(target.id),
    });
    expect(session.metadata[METADATA.invoiceId]).toBe(String(target.id));

    const again = await link(target.id, {}, 200);
    expect(again).toMatchObject({ sessionId: first.sessionId, url: first.url, created: false });
    expect(pay.sessions.size).toBe(sessionsBefore + 1);
    const row = await invoiceRow(target.id);
    expect(row).toMatchObject({ paymentLinkUrl: first.url, paymentSessionId: first.sessionId });
  });

  it('paid at the service, comes back as a signed webhook: invoice paid, balance 0, job paid', async () => {
    const target = await freshInvoice(api);
    const { sessionId } = await link(target.id);
    const { event, delivery } = await pay.pay(sessionId);
    expect(delivery.status, delivery.body).toBe(200);
    const answer = receipt(delivery.body);
    expect(answer).toMatchObject({ eventId: event.id, outcome: 'recorded' });

    const after = await invoice(target.id);
    expect(after).toMatchObject({ status: 'paid', paidCents: target.totalCents, balanceCents: 0 });
    expect(after.payments).toHaveLength(1);
    expect(after.payments[0]).toMatchObject({
      id: answer.paymentId,
      method: 'card',
      amountCents: target.totalCents,
      reference: pay.sessions.get(sessionId)!.payment_intent,
      recordedBy: null,
      receivedAt: SEED_TODAY.toISOString(),
    });
    expect(await jobStatus(target.jobId)).toBe('paid');
    const [stored] = await paymentsOf(target.id);
    expect(stored!.providerEventId).toBe(event.id);
    expect(await seenEvents(event.id)).toBe(1);
    const audit = await db()
      .select()
      .from(t.auditEvents)
      .where(
        and(
          eq(t.auditEvents.action, 'payment.recorded'),
          eq(t.auditEvents.entityId, String(answer.paymentId)),
        ),
      );
    expect(audit).toHaveLength(1);
    expect(audit[0]!.actorId).toBeNull();
  });

  it('lands once when the same event is delivered twice, one after the other or both at once', async () => {
    const target = await freshInvoice(api);
    const { sessionId } = await link(target.id);
    const { event } = await pay.pay(sessionId);
    const before = await invoiceRow(target.id);

    const again = await pay.resend(event.id);
    expect(again.status).toBe(200);
    expect(receipt(again.body)).toMatchObject({ eventId: event.id, outcome: 'duplicate', paymentId: null });
    const racing = await Promise.all([pay.resend(event.id), pay.resend(event.id)]);
    expect(racing.map((d) => [d.status, receipt(d.body).outcome])).toEqual([
      [200, 'duplicate'],
      [200, 'duplicate'],
    ]);

    expect(await paymentsOf(target.id)).toHaveLength(1);
    expect(await seenEvents(event.id)).toBe(1);
    expect(await invoiceRow(target.id)).toEqual(before);
  });

  it('refuses a bad signature with 400 and stores nothing; the same event signed right is taken', async () => {
    const target = await freshInvoice(api);
    const event = completedEvent(target, (await invoiceRow(target.id)).businessId);
    const payload = JSON.stringify(event);
    const now = Math.floor(Date.now() / 1000);

    const wrongSecret = await postWebhook(payload, signatureHeader(payload, 'whsec_not_the_secret', now));
    const altered = await postWebhook(
      payload.replace(`"amount_total":${target.totalCents}`, '"amount_total":1'),
      signatureHeader(payload, pay.webhookSecret, now),
    );
    const missing = await postWebhook(payload);
    const garbage = await postWebhook(payload, 'not a signature');
    for (const response of [wrongSecret, altered, missing, garbage]) {
      expect(response.status).toBe(400);
      expect(response.body.error.code).toBe('bad_signature');
    }
    expect(await seenEvents(event.id)).toBe(0);
    expect(await paymentsOf(target.id)).toHaveLength(0);
    expect(await invoiceRow(target.id)).toMatchObject({ status: 'issued', balanceCents: target.totalCents });

    // The control: the very same bytes, signed with the webhook secret, are accepted.
    const signed = await postWebhook(payload, signatureHeader(payload, pay.webhookSecret, now)).expect(200);
    expect(WebhookReceiptSchema.parse(signed.body)).toMatchObject({ outcome: 'recorded' });
    expect(await invoiceRow(target.id)).toMatchObject({ status: 'paid', balanceCents: 0 });
  });

  it('takes part by card, part in cash, and the rest by card', async () => {
    const target = await freshInvoice(api);
    const deposit = await link(target.id, { amountCents: 10_000 });
    expect(deposit.amountCents).toBe(10_000);
    await pay.pay(deposit.sessionId);
    // Hand arithmetic: 39 352 − 10 000 = 29 352 ¢ left.
    expect(await invoiceRow(target.id)).toMatchObject({
      status: 'part_paid',
      paidCents: 10_000,
      balanceCents: 29_352,
    });
    expect(await jobStatus(target.jobId)).toBe('invoiced');

    await cash(target.id, 5_000);
    const rest = await link(target.id);
    // 29 352 − 5 000 = 24 352 ¢: a new checkout, since the deposit's is complete.
    expect(rest).toMatchObject({ amountCents: 24_352, created: true });
    expect(rest.sessionId).not.toBe(deposit.sessionId);
    const { delivery } = await pay.pay(rest.sessionId);
    expect(receipt(delivery.body).outcome).toBe('recorded');

    expect(await invoiceRow(target.id)).toMatchObject({ status: 'paid', paidCents: 39_352, balanceCents: 0 });
    expect(await jobStatus(target.jobId)).toBe('paid');
    const rows = await paymentsOf(target.id);
    expect(rows.map((p) => [p.method, p.amountCents])).toEqual([
      ['card', 10_000],
      ['cash', 5_000],
      ['card', 24_352],
    ]);
  });

  it('keeps a refund as a negative payment and reopens the invoice; a refund already counted adds nothing', async () => {
    const target = await freshInvoice(api);
    const { sessionId } = await link(target.id);
    await pay.pay(sessionId);
    expect(await jobStatus(target.jobId)).toBe('paid');

    const first = await pay.refund(sessionId, 2_500);
    expect(receipt(first.delivery.body).outcome).toBe('recorded');
    const after = await invoice(target.id);
    // 39 352 − 2 500 = 36 852 ¢ paid, 2 500 ¢ open again.
    expect(after).toMatchObject({ status: 'part_paid', paidCents: 36_852, balanceCents: 2_500 });
    const intent = pay.sessions.get(sessionId)!.payment_intent;
    expect(after.payments.map((p) => [p.method, p.amountCents, p.reference])).toEqual([
      ['card', 39_352, intent],
      ['card', -2_500, intent],
    ]);
    expect(await jobStatus(target.jobId)).toBe('invoiced');
    const list = PaymentListSchema.parse(
      (
        await request(api.app)
          .get(`/api/invoices/${target.id}/payments`)
          .set(as(api, 'bookkeeper'))
          .expect(200)
      ).body,
    );
    expect(list.items.map((p) => p.amountCents)).toEqual([-2_500, 39_352]);

    // Redelivered: nothing changes. The same running total under a new event id: nothing new either.
    expect(receipt((await pay.resend(first.event.id)).body).outcome).toBe('duplicate');
    const repeat = { ...first.event, id: `evt_test_${randomBytes(8).toString('hex')}` };
    const payload = JSON.stringify(repeat);
    const response = await postWebhook(
      payload,
      signatureHeader(payload, pay.webhookSecret, Math.floor(Date.now() / 1000)),
    );
    expect(response.status).toBe(200);
    expect(response.body.outcome).toBe('nothing_new');
    expect(await paymentsOf(target.id)).toHaveLength(2);

    // The rest of the charge refunded: nothing paid, the whole total owed again.
    const rest = await pay.refund(sessionId);
    expect(receipt(rest.delivery.body).outcome).toBe('recorded');
    expect(await invoiceRow(target.id)).toMatchObject({
      status: 'issued',
      paidCents: 0,
      balanceCents: 39_352,
    });
    expect((await paymentsOf(target.id)).map((p) => p.amountCents)).toEqual([39_352, -2_500, -36_852]);
  });

  it('replaces an open link whose amount is out of date, expiring the old one at the service', async () => {
    const target = await freshInvoice(api);
    const old = await link(target.id);
    await cash(target.id, 1_000);
    const fresh = await link(target.id);
    expect(fresh).toMatchObject({ amountCents: 38_352, created: true });
    expect(pay.sessions.get(old.sessionId)!.status).toBe('expired');
    await expect(pay.pay(old.sessionId)).rejects.toThrow(/expired/);
    expect(await invoiceRow(target.id)).toMatchObject({
      paymentSessionId: fresh.sessionId,
      paymentLinkUrl: fresh.url,
    });
  });

  it('expires an open card link when its invoice is voided, so the customer cannot pay it', async () => {
    const target = await freshInvoice(api);
    const open = await link(target.id);
    await request(api.app)
      .patch(`/api/invoices/${target.id}`)
      .set(owner())
      .send({ status: 'void' })
      .expect(200);
    expect(pay.sessions.get(open.sessionId)!.status).toBe('expired');
    await expect(pay.pay(open.sessionId)).rejects.toThrow(/expired/);
    expect(await invoiceRow(target.id)).toMatchObject({
      status: 'void',
      paymentSessionId: null,
      paymentLinkUrl: null,
    });
  });

  it('expires an open card link when money is taken by hand, so the customer cannot pay the old amount on top', async () => {
    const target = await freshInvoice(api);
    const open = await link(target.id);
    await cash(target.id, 1_000);
    expect(pay.sessions.get(open.sessionId)!.status).toBe('expired');
    await expect(pay.pay(open.sessionId)).rejects.toThrow(/expired/);
    // Hand arithmetic: 39 352 − 1 000 = 38 352 ¢ left, and no link until one is made for it.
    expect(await invoiceRow(target.id)).toMatchObject({
      balanceCents: 38_352,
      paymentSessionId: null,
      paymentLinkUrl: null,
    });
    expect(await link(target.id)).toMatchObject({ amountCents: 38_352, created: true });
  });

  it('records card money beyond the balance as owed back, and keeps money for a void invoice out of the books', async () => {
    const over = await freshInvoice(api);
    const { sessionId } = await link(over.id);
    // Paid at the service a moment before cash was taken by hand, its notice arriving after: the
    // service will not expire a paid session, and the money it took is recorded all the same.
    const webhookUrl = pay.webhookUrl;
    pay.webhookUrl = null;
    const paidFirst = await pay.pay(sessionId);
    pay.webhookUrl = webhookUrl;
    await cash(over.id, 1_000);
    const delivery = await pay.resend(paidFirst.event.id);
    expect(receipt(delivery.body).outcome).toBe('recorded');
    expect(await invoiceRow(over.id)).toMatchObject({
      status: 'paid',
      paidCents: 40_352,
      balanceCents: -1_000,
    });
    const [overpaid] = await db()
      .select()
      .from(t.auditEvents)
      .where(and(eq(t.auditEvents.action, 'payment.overpaid'), eq(t.auditEvents.entityType, 'payment')))
      .orderBy(t.auditEvents.id);
    expect(overpaid).toBeDefined();

    // Paid at the service a moment before the void, its notice arriving after: the void still
    // goes through (nothing is paid on the books yet), the service will not expire a paid session,
    // and the money stays out of the books.
    const voided = await freshInvoice(api);
    const voidLink = await link(voided.id);
    pay.webhookUrl = null;
    const paidVoid = await pay.pay(voidLink.sessionId);
    expect(paidVoid.delivery.status).toBeNull();
    pay.webhookUrl = webhookUrl;
    await request(api.app)
      .patch(`/api/invoices/${voided.id}`)
      .set(owner())
      .send({ status: 'void' })
      .expect(200);
    const late = await pay.resend(paidVoid.event.id);
    expect(late.status).toBe(200);
    expect(receipt(late.body).outcome).toBe('unapplied');
    expect(await paymentsOf(voided.id)).toHaveLength(0);
    const unapplied = await db()
      .select()
      .from(t.auditEvents)
      .where(
        and(eq(t.auditEvents.action, 'payment.unapplied'), eq(t.auditEvents.entityId, String(voided.id))),
      );
    expect(unapplied).toHaveLength(1);
    expect(await seenEvents(paidVoid.event.id)).toBe(1);
  });

  it('refuses a link for nothing owed, for more than the balance, and a bad body', async () => {
    const target = await freshInvoice(api);
    const tooMuch = await request(api.app)
      .post(invoicePaymentLinkPath(target.id))
      .set(owner())
      .send({ amountCents: 39_353 });
    expect(tooMuch.status).toBe(409);
    expect(tooMuch.body.error.details).toEqual({ balanceCents: 39_352 });
    for (const body of [{ amountCents: 0 }, { amountCents: 12.5 }, { amount: 100 }]) {
      const bad = await request(api.app).post(invoicePaymentLinkPath(target.id)).set(owner()).send(body);
      expect(bad.status).toBe(400);
    }
    await cash(target.id, 39_352);
    const nothing = await request(api.app).post(invoicePaymentLinkPath(target.id)).set(owner()).send({});
    expect(nothing.status).toBe(409);
    expect(await invoiceRow(target.id)).toMatchObject({ paymentSessionId: null, paymentLinkUrl: null });
  });
});

/** Every page's text, items joined by spaces (pdfjs-dist, as in invoice-pdf.test.ts). */
async function pdfText(bytes: Buffer): Promise<string> {
  const pdf = await getDocument({ data: new Uint8Array(bytes), disableFontFace: true }).promise;
  const pages: string[] = [];
  for (let n = 1; n <= pdf.numPages; n += 1) {
    const content = await (await pdf.getPage(n)).getTextContent();
    pages.push(content.items.map((item) => ('str' in item ? item.str : '')).join(' '));
  }
  await pdf.destroy();
  return pages.join('\n');
}

describe('an invoice sent with card payments set up', () => {
  it('goes out as a PDF e-mail with the payment link; paid at that link, the invoice shows paid', async () => {
    const target = await freshInvoice(api);
    const before = smtp.messages.length;
    const sent = InvoiceSentSchema.parse(
      (await request(api.app).post(`/api/invoices/${target.id}/send`).set(owner()).expect(202)).body,
    );
    expect(sent).toMatchObject({ status: 'sent', paymentLinkError: null });
    const url = sent.paymentLinkUrl!;
    expect(url).toMatch(new RegExp(`^${pay.url}/pay/cs_test_[0-9a-f]+$`));

    expect(smtp.messages).toHaveLength(before + 1);
    const mail = smtp.messages.at(-1)!;
    expect(mail.text).toContain(`Pay by card: ${url}`);
    const text = await pdfText(mail.attachments[0]!.content);
    expect(text).toContain(url);

    // The customer opens the link and pays on the service's page (a form post, as a browser sends it).
    const page = await fetch(url);
    expect(await page.text()).toContain('393.52 USD');
    const paid = await fetch(url, {
      method: 'POST',
      headers: { 'content-type': 'application/x-www-form-urlencoded' },
      body: '',
    });
    expect(paid.status).toBe(200);
    expect(await paid.text()).toContain("The shop's server answered 200.");

    const after = await invoice(target.id);
    expect(after).toMatchObject({ status: 'paid', balanceCents: 0, paidCents: target.totalCents });
    expect(await jobStatus(target.jobId)).toBe('paid');
  });

  it('shows the link in `vanbay invoice send`, and in its --json', async () => {
    const url = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
    const vanbay = async (...argv: string[]) => {
      const io = fakeDeps(fetch, {
        VANBAY_URL: url,
        XDG_CONFIG_HOME: mkdtempSync(path.join(tmpdir(), 'vanbay-config-')),
        VANBAY_TOKEN: api.tokens.owner,
      });
      const code = await runCli(argv, io.deps);
      return { code, stdout: io.stdout(), stderr: io.stderr() };
    };
    const first = await freshInvoice(api);
    const plain = await vanbay('invoice', 'send', String(first.id));
    expect(plain.code, plain.stderr).toBe(0);
    const stored = (await invoiceRow(first.id)).paymentLinkUrl!;
    expect(stored).toMatch(/\/pay\/cs_test_/);
    expect(plain.stdout).toContain(`pay by card: ${stored}`);

    const second = await freshInvoice(api);
    const json = await vanbay('invoice', 'send', String(second.id), '--json');
    expect(json.code, json.stderr).toBe(0);
    const sent = InvoiceSentSchema.parse(JSON.parse(json.stdout));
    expect(sent.paymentLinkUrl).toBe((await invoiceRow(second.id)).paymentLinkUrl);
    expect(sent.paymentLinkUrl).not.toBeNull();
  });

  it('still goes out when the payment service is down, without a link and saying why', async () => {
    const dead = await startFakePaymentServer();
    await dead.close();
    const app = createApp({
      db: db(),
      clock: () => api.clock.now,
      uploadsDir: tempUploadsDir(),
      secret,
      mailer,
      payments: createStripeProvider({
        secretKey: dead.apiKey,
        webhookSecret: dead.webhookSecret,
        apiBase: dead.url,
        successUrl,
        maxNetworkRetries: 0,
      }),
    });
    const target = await freshInvoice(api);
    const before = smtp.messages.length;
    const sent = InvoiceSentSchema.parse(
      (await request(app).post(`/api/invoices/${target.id}/send`).set(owner()).expect(202)).body,
    );
    expect(sent).toMatchObject({ status: 'sent', paymentLinkUrl: null });
    expect(sent.paymentLinkError).toMatch(/^The card payment service did not accept the request/);
    expect(smtp.messages).toHaveLength(before + 1);
    expect(smtp.messages.at(-1)!.text).not.toContain('Pay by card');
  });

  it('answers 503 on the link and the webhook when card payments are not set up', async () => {
    const app = createApp({
      db: db(),
      clock: () => api.clock.now,
      uploadsDir: tempUploadsDir(),
      secret,
      mailer,
    });
    const target = await freshInvoice(api);
    const linkAnswer = await request(app).post(invoicePaymentLinkPath(target.id)).set(owner()).send({});
    expect(linkAnswer.status).toBe(503);
    expect(linkAnswer.body.error.code).toBe('payments_not_set_up');
    const hook = await request(app)
      .post(PAYMENT_WEBHOOK_PATH)
      .set('Content-Type', 'application/json')
      .send('{}');
    expect(hook.status).toBe(503);
    // The send still works, with no link.
    const sent = InvoiceSentSchema.parse(
      (await request(app).post(`/api/invoices/${target.id}/send`).set(owner()).expect(202)).body,
    );
    expect(sent).toMatchObject({ status: 'sent', paymentLinkUrl: null, paymentLinkError: null });
  });
});
