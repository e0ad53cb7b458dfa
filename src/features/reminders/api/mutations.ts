import { useMutation, useQueryClient } from '@tanstack/react-query';
import { OutboxItemSchema } from '../../../../shared/api/outbox';
import { REMINDERS_PATH, ReminderSchema } from '../../../../shared/api/reminders';
import type { DueItem } from '../../../../shared/api/reminders';
import { ApiError, jsonInit, request } from '../../../lib/api-client';
import { reminderQueries } from './queries';

/** `POST /api/reminders/:id/send` (server/routes/invoice-send.ts); `?again=true` once it has gone. */
const reminderSendPath = (id: number, again: boolean) =>
  `${REMINDERS_PATH}/${id}/send${again ? '?again=true' : ''}`;

/**
 * The reminder this round of the interval is sent under: its open one, else a new one. A 409 on
 * creating means another tab or the CLI wrote one a moment ago; that one is used.
 */
async function openReminderId(item: DueItem): Promise<number> {
  const current = item.reminder;
  if (current && (current.status === 'pending' || current.status === 'sent')) return current.id;
  try {
    const created = await request(
      REMINDERS_PATH,
      ReminderSchema,
      jsonInit('POST', { serviceIntervalId: item.serviceIntervalId }),
    );
    return created.id;
  } catch (error) {
    const existing = error instanceof ApiError && error.status === 409 ? reminderIdIn(error.details) : null;
    if (existing === null) throw error;
    return existing;
  }
}

function reminderIdIn(details: unknown): number | null {
  const id = (details as { reminderId?: unknown } | undefined)?.reminderId;
  return typeof id === 'number' ? id : null;
}

/** `again` sends once more: a reminder already sent, or one whose mail waits to be tried now. */
export async function sendReminder(item: DueItem, again = item.reminder?.status === 'sent') {
  const id = await openReminderId(item);
  return request(reminderSendPath(id, again), OutboxItemSchema, {
    method: 'POST',
  });
}

/**
 * Mails the customer; the due list then shows the reminder as sent (or waiting for a retry). It
 * is re-read after a failure too: the reminder may have been written before the mail was refused.
 */
export function useSendReminder() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ item, again }: { item: DueItem; again?: boolean }) => sendReminder(item, again),
    onSettled: () => queryClient.invalidateQueries({ queryKey: reminderQueries.lists() }),
  });
}
