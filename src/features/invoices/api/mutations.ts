import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { QueryClient } from '@tanstack/react-query';
import { invoicePath, invoicePaymentsPath, RecordedPaymentSchema } from '../../../../shared/api/invoices';
import type { CreatePaymentInput, RecordedPayment } from '../../../../shared/api/invoices';
import {
  invoicePaymentLinkPath,
  InvoiceSentSchema,
  PaymentLinkSchema,
} from '../../../../shared/api/payments';
import type { InvoiceSent, PaymentLink } from '../../../../shared/api/payments';
import { jsonInit, request } from '../../../lib/api-client';
import { invoiceQueries } from './queries';

/**
 * What changed when one invoice changed: its own page, and every list (its row shows the status,
 * the balance and the link). Other invoices' pages are left alone.
 */
function invoiceChanged(queryClient: QueryClient, id: number) {
  return Promise.all([
    queryClient.invalidateQueries({ queryKey: invoiceQueries.detail(id).queryKey }),
    queryClient.invalidateQueries({ queryKey: invoiceQueries.lists() }),
  ]);
}

export function recordPayment(id: number, input: CreatePaymentInput): Promise<RecordedPayment> {
  return request(invoicePaymentsPath(id), RecordedPaymentSchema, jsonInit('POST', input));
}

export function useRecordPayment(id: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: CreatePaymentInput) => recordPayment(id, input),
    onSuccess: ({ invoice, payment }) => {
      // The answer carries the new balance: show it at once, then fetch the page to be sure.
      queryClient.setQueryData(invoiceQueries.detail(id).queryKey, (old) =>
        old ? { ...old, ...invoice, payments: [...old.payments, payment] } : old,
      );
      return invoiceChanged(queryClient, id);
    },
  });
}

// The send answer names the link the PDF carries; older servers leave those two fields out.
const SendAnswerSchema = InvoiceSentSchema.partial({ paymentLinkUrl: true, paymentLinkError: true });

export function sendInvoice(id: number, again: boolean): Promise<Partial<InvoiceSent>> {
  const query = again ? '?again=true' : '';
  return request(`${invoicePath(id)}/send${query}`, SendAnswerSchema, { method: 'POST' });
}

export function useSendInvoice(id: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ again }: { again: boolean }) => sendInvoice(id, again),
    onSuccess: () => invoiceChanged(queryClient, id),
  });
}

export function createPaymentLink(id: number): Promise<PaymentLink> {
  return request(invoicePaymentLinkPath(id), PaymentLinkSchema, jsonInit('POST', {}));
}

export function useCreatePaymentLink(id: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => createPaymentLink(id),
    onSuccess: () => invoiceChanged(queryClient, id),
  });
}
