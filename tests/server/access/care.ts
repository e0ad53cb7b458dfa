import request from 'supertest';
import { as, type Caller } from '../../helpers/api';
import { statuses, type AccessRow, type Fixtures } from './types';

/** PNG file signature (ISO/IEC 15948 §5.2): enough for the upload's type sniffing. */
const PNG_BYTES = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 0]);

/** An attachment the owner uploads to a job, for the rows that read or delete one. */
async function freshAttachment(f: Fixtures, jobId: number): Promise<number> {
  const response = await request(f.api.app)
    .post(`/api/jobs/${jobId}/attachments`)
    .set(as(f.api, 'owner'))
    .attach('file', PNG_BYTES, { filename: 'matrix-gauge.png', contentType: 'image/png' })
    .expect(201);
  return response.body.id as number;
}

async function freshInterval(f: Fixtures): Promise<number> {
  const response = await request(f.api.app)
    .post(`/api/machines/${f.ownMachineId}/intervals`)
    .set(as(f.api, 'owner'))
    .send({ item: 'spark_plug', label: 'Matrix spark plugs', everyMonths: 24, lastDoneOn: '2025-01-15' })
    .expect(201);
  return response.body.id as number;
}

async function freshReminder(f: Fixtures): Promise<number> {
  const response = await request(f.api.app)
    .post('/api/reminders')
    .set(as(f.api, 'owner'))
    .send({ serviceIntervalId: await freshInterval(f) })
    .expect(201);
  return response.body.id as number;
}

/** The interval each caller's reminder row targets, made in `path` (which may wait) for `body`. */
const reminderTargets = new Map<Caller, number>();

export const careRows: AccessRow[] = [
  {
    name: 'GET /api/jobs/:own/attachments',
    method: 'get',
    path: (f) => `/api/jobs/${f.ownJobId}/attachments`,
    expect: statuses(200, 200, 403, 200),
  },
  {
    name: "GET /api/jobs/:other/attachments (another customer's job)",
    method: 'get',
    path: (f) => `/api/jobs/${f.otherJobId}/attachments`,
    expect: statuses(200, 200, 403, 404),
  },
  {
    // The matrix sends JSON; the upload itself (multipart) is proven in attachments.test.ts.
    name: 'POST /api/jobs/:own/attachments (JSON, not multipart)',
    method: 'post',
    path: (f) => `/api/jobs/${f.ownJobId}/attachments`,
    body: () => ({ caption: 'not a file' }),
    expect: statuses(415, 415, 403, 403),
  },
  {
    name: 'GET /api/jobs/:own/attachments/:attachment/file',
    method: 'get',
    path: async (f) => `/api/jobs/${f.ownJobId}/attachments/${await freshAttachment(f, f.ownJobId)}/file`,
    expect: statuses(200, 200, 403, 200),
  },
  {
    name: "GET /api/jobs/:other/attachments/:attachment/file (another customer's job)",
    method: 'get',
    path: async (f) => `/api/jobs/${f.otherJobId}/attachments/${await freshAttachment(f, f.otherJobId)}/file`,
    expect: statuses(200, 200, 403, 404),
  },
  {
    name: 'DELETE /api/jobs/:own/attachments/:attachment',
    method: 'delete',
    path: async (f) => `/api/jobs/${f.ownJobId}/attachments/${await freshAttachment(f, f.ownJobId)}`,
    expect: statuses(204, 403, 403, 403),
  },
  {
    name: 'GET /api/machines/:own/intervals',
    method: 'get',
    path: (f) => `/api/machines/${f.ownMachineId}/intervals`,
    expect: statuses(200, 200, 200, 403),
  },
  {
    name: 'POST /api/machines/:own/intervals',
    method: 'post',
    path: (f) => `/api/machines/${f.ownMachineId}/intervals`,
    body: () => ({ item: 'oil', label: 'Engine oil', everyMonths: 12, lastDoneOn: '2026-06-01' }),
    expect: statuses(201, 201, 403, 403),
  },
  {
    name: 'PATCH /api/machines/:own/intervals/:interval',
    method: 'patch',
    path: async (f) => `/api/machines/${f.ownMachineId}/intervals/${await freshInterval(f)}`,
    body: () => ({ lastDoneOn: '2026-11-01' }),
    expect: statuses(200, 200, 403, 403),
  },
  {
    name: 'DELETE /api/machines/:own/intervals/:interval',
    method: 'delete',
    path: async (f) => `/api/machines/${f.ownMachineId}/intervals/${await freshInterval(f)}`,
    expect: statuses(204, 403, 403, 403),
  },
  {
    name: 'GET /api/reminders',
    method: 'get',
    path: () => '/api/reminders',
    expect: statuses(200, 200, 200, 403),
  },
  {
    name: 'POST /api/reminders',
    method: 'post',
    path: async (f, caller) => {
      reminderTargets.set(caller, await freshInterval(f));
      return '/api/reminders';
    },
    body: (_f, caller) => ({ serviceIntervalId: reminderTargets.get(caller) }),
    expect: statuses(201, 403, 403, 403),
  },
  {
    name: 'PATCH /api/reminders/:id',
    method: 'patch',
    path: async (f) => `/api/reminders/${await freshReminder(f)}`,
    body: () => ({ status: 'dismissed' }),
    expect: statuses(200, 403, 403, 403),
  },
];
