import { Router } from 'express';
import { IdParamsSchema } from '../../shared/api/common';
import {
  CreateReminderInputSchema,
  DueListQuerySchema,
  REMINDER_PATH,
  REMINDERS_PATH,
  UpdateReminderInputSchema,
} from '../../shared/api/reminders';
import { allow } from '../auth/middleware';
import { parse } from '../http/validate';
import { createReminder, listDue, updateReminder } from '../services/reminders';
import type { RouteDeps } from './deps';

export function remindersRouter({ db, now }: RouteDeps) {
  const router = Router();

  router.get(REMINDERS_PATH, allow('reminders', 'list'), async (req, res) => {
    const query = parse(DueListQuerySchema, req.query, 'query');
    res.json(await listDue(db, req.actor!, query, now()));
  });
  router.post(REMINDERS_PATH, allow('reminders', 'create'), async (req, res) => {
    const input = parse(CreateReminderInputSchema, req.body);
    res.status(201).json(await createReminder(db, req.actor!, input, now()));
  });
  router.patch(REMINDER_PATH, allow('reminders', 'update'), async (req, res) => {
    const { id } = parse(IdParamsSchema, req.params, 'path');
    const input = parse(UpdateReminderInputSchema, req.body);
    res.json(await updateReminder(db, req.actor!, id, input, now()));
  });
  return router;
}
