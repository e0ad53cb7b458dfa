import { Router } from 'express';
import { z } from 'zod';
import { IdParamsSchema } from '../../shared/api/common';
import { INVOICES_PATH } from '../../shared/api/invoices';
import { REMINDERS_PATH } from '../../shared/api/reminders';
import { allow } from '../auth/middleware';
import { parse } from '../http/validate';
import { linkForSending, storedPaymentLink } from '../services/card-payments';
import { sendInvoiceMail, sendReminderMail } from '../services/mail';
import type { InvoiceSent } from '../../shared/api/payments';
import type { RouteDeps } from './deps';

export const INVOICE_SEND_PATH = `${INVOICES_PATH}/:id/send`;
export const REMINDER_SEND_PATH = `${REMINDERS_PATH}/:id/send`;

/** `?again=true` sends something already sent once more; anything else but `false` is a 400. */
export const SendQuerySchema = z.strictObject({
  again: z
    .enum(['true', 'false'])
    .optional()
    .transform((value) => value === 'true'),
});

/**
 * 202: the mail is in the outbox, sent or failed and waiting for a retry. With card payments set
 * up, the PDF carries a card link for the balance, made (or reused) just before it is rendered.
 */
export function invoiceSendRouter({ db, now, mailer, payments }: RouteDeps) {
  const router = Router();
  router.post(INVOICE_SEND_PATH, allow('invoices', 'update'), async (req, res) => {
    const { id } = parse(IdParamsSchema, req.params, 'path');
    const { again } = parse(SendQuerySchema, req.query, 'query');
    const actor = req.actor!;
    let paymentLinkError: string | null = null;
    const beforeRender = async () => {
      paymentLinkError = (await linkForSending(db, payments, actor, id, now())).error;
    };
    const mail = await sendInvoiceMail(db, mailer, actor, id, { again, beforeRender }, now());
    const sent: InvoiceSent = {
      ...mail,
      paymentLinkUrl: await storedPaymentLink(db, actor, id),
      paymentLinkError,
    };
    res.status(202).json(sent);
  });
  return router;
}

export function reminderSendRouter({ db, now, mailer }: RouteDeps) {
  const router = Router();
  router.post(REMINDER_SEND_PATH, allow('reminders', 'update'), async (req, res) => {
    const { id } = parse(IdParamsSchema, req.params, 'path');
    const { again } = parse(SendQuerySchema, req.query, 'query');
    res.status(202).json(await sendReminderMail(db, mailer, req.actor!, id, { again }, now()));
  });
  return router;
}
