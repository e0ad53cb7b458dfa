import request from 'supertest';
import { as } from '../../helpers/api';
import { freshInvoice } from './money';
import { statuses, type AccessRow, type Fixtures } from './types';

/** A pending reminder on the demo customer's machine (the customer has an e-mail address). */
async function freshReminder(f: Fixtures): Promise<number> {
  const interval = await request(f.api.app)
    .post(`/api/machines/${f.ownMachineId}/intervals`)
    .set(as(f.api, 'owner'))
    .send({ item: 'oil', label: 'Matrix oil change', everyMonths: 6, lastDoneOn: '2025-01-15' })
    .expect(201);
  const reminder = await request(f.api.app)
    .post('/api/reminders')
    .set(as(f.api, 'owner'))
    .send({ serviceIntervalId: interval.body.id })
    .expect(201);
  return reminder.body.id as number;
}

// Sending is the owner's (policy: invoices update, reminders update); each caller gets a fresh
// target so the owner's 202 is a first send, never the 409 of a repeat.
export const mailRows: AccessRow[] = [
  {
    name: 'POST /api/invoices/:id/send',
    method: 'post',
    path: async (f) => `/api/invoices/${(await freshInvoice(f.api)).id}/send`,
    expect: statuses(202, 403, 403, 403),
  },
  {
    name: 'POST /api/reminders/:id/send',
    method: 'post',
    path: async (f) => `/api/reminders/${await freshReminder(f)}/send`,
    expect: statuses(202, 403, 403, 403),
  },
];
