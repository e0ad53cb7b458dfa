import { sql } from 'drizzle-orm';
import request from 'supertest';
import { queryRows } from '../../../server/db/client';
import { as } from '../../helpers/api';
import { statuses, type AccessRow, type Fixtures } from './types';

/** The demo customer's job that is still open for pricing (not invoiced, paid or cancelled). */
async function openJob(f: Fixtures): Promise<number> {
  const [row] = await queryRows<{ id: number }>(
    f.api.database.db,
    sql`select id from jobs where customer_id = ${f.ownCustomerId}
        and status not in ('invoiced', 'paid', 'cancelled') order by id limit 1`,
  );
  if (!row) throw new Error('seed has no open job for the demo customer');
  return row.id;
}

async function post(f: Fixtures, path: string, body: object): Promise<number> {
  const response = await request(f.api.app).post(path).set(as(f.api, 'owner')).send(body);
  if (response.status !== 201)
    throw new Error(`${path}: ${response.status} ${JSON.stringify(response.body)}`);
  return response.body.id as number;
}

const freshReading = (f: Fixtures) =>
  post(f, `/api/jobs/${f.ownJobId}/readings`, { quantity: 'voltage', value: '12.6V' });

/** A run started by the owner, with the first step answered when `answered` is set. */
const freshRun = (f: Fixtures, answered = false) =>
  post(f, `/api/jobs/${f.ownJobId}/checks`, {
    procedure: 'fuel-delivery',
    ...(answered ? { steps: [{ stepKey: 'symptoms', answer: { symptoms: [] } }] } : {}),
  });

/** A battery check finished at its first step (12.05 V flooded is under 25 %), on an open job. */
async function finishedRun(f: Fixtures): Promise<string> {
  const jobId = await openJob(f);
  const runId = await post(f, `/api/jobs/${jobId}/checks`, {
    procedure: 'battery-charging',
    steps: [
      {
        stepKey: 'battery-rest',
        answer: { batteryType: 'flooded', volts: { value: 12.05, unit: 'V' } },
        cautionAcknowledged: true,
      },
    ],
  });
  return `/api/jobs/${jobId}/checks/${runId}`;
}

async function freshLine(f: Fixtures): Promise<string> {
  const jobId = await openJob(f);
  const id = await post(f, `/api/jobs/${jobId}/line-items`, {
    kind: 'labour',
    description: 'Matrix row labour',
    quantity: 0.5,
  });
  return `/api/jobs/${jobId}/line-items/${id}`;
}

async function someRun(f: Fixtures, jobId: number): Promise<number> {
  const [row] = await queryRows<{ id: number }>(
    f.api.database.db,
    sql`select id from check_runs where job_id = ${jobId} order by id limit 1`,
  );
  if (!row) throw new Error(`seed has no check run on job ${jobId}`);
  return row.id;
}

export const jobRecordRows: AccessRow[] = [
  {
    name: 'GET /api/jobs/:own/readings',
    method: 'get',
    path: (f) => `/api/jobs/${f.ownJobId}/readings`,
    expect: statuses(200, 200, 403, 200),
  },
  {
    name: "GET /api/jobs/:other/readings (another customer's job)",
    method: 'get',
    path: (f) => `/api/jobs/${f.otherJobId}/readings`,
    expect: statuses(200, 200, 403, 404),
  },
  {
    name: 'POST /api/jobs/:own/readings',
    method: 'post',
    path: (f) => `/api/jobs/${f.ownJobId}/readings`,
    body: () => ({ quantity: 'pressure', value: '43psi' }),
    expect: statuses(201, 201, 403, 403),
  },
  {
    name: 'DELETE /api/jobs/:own/readings/:readingId',
    method: 'delete',
    path: async (f) => `/api/jobs/${f.ownJobId}/readings/${await freshReading(f)}`,
    expect: statuses(204, 403, 403, 403),
  },
  {
    name: 'GET /api/jobs/:own/checks',
    method: 'get',
    path: (f) => `/api/jobs/${f.ownJobId}/checks`,
    expect: statuses(200, 200, 403, 200),
  },
  {
    name: "GET /api/jobs/:other/checks (another customer's job)",
    method: 'get',
    path: (f) => `/api/jobs/${f.otherJobId}/checks`,
    expect: statuses(200, 200, 403, 404),
  },
  {
    name: 'POST /api/jobs/:own/checks',
    method: 'post',
    path: (f) => `/api/jobs/${f.ownJobId}/checks`,
    body: () => ({ procedure: 'fuel' }),
    expect: statuses(201, 201, 403, 403),
  },
  {
    name: 'GET /api/jobs/:own/checks/:runId',
    method: 'get',
    path: async (f) => `/api/jobs/${f.ownJobId}/checks/${await someRun(f, f.ownJobId)}`,
    expect: statuses(200, 200, 403, 200),
  },
  {
    name: "GET /api/jobs/:other/checks/:runId (another customer's run)",
    method: 'get',
    path: async (f) => `/api/jobs/${f.otherJobId}/checks/${await someRun(f, f.otherJobId)}`,
    expect: statuses(200, 200, 403, 404),
  },
  {
    name: 'POST /api/jobs/:own/checks/:runId/steps',
    method: 'post',
    path: async (f) => `/api/jobs/${f.ownJobId}/checks/${await freshRun(f)}/steps`,
    body: () => ({ stepKey: 'symptoms', answer: { symptoms: ['no_start'] } }),
    expect: statuses(201, 201, 403, 403),
  },
  {
    name: 'POST /api/jobs/:own/checks/:runId/back',
    method: 'post',
    path: async (f) => `/api/jobs/${f.ownJobId}/checks/${await freshRun(f, true)}/back`,
    expect: statuses(200, 200, 403, 403),
  },
  {
    name: 'POST /api/jobs/:own/checks/:runId/pause',
    method: 'post',
    path: async (f) => `/api/jobs/${f.ownJobId}/checks/${await freshRun(f)}/pause`,
    expect: statuses(200, 200, 403, 403),
  },
  {
    name: 'POST /api/jobs/:open/checks/:runId/apply-lines',
    method: 'post',
    path: async (f) => `${await finishedRun(f)}/apply-lines`,
    expect: statuses(201, 403, 403, 403),
  },
  {
    name: 'GET /api/jobs/:own/line-items',
    method: 'get',
    path: (f) => `/api/jobs/${f.ownJobId}/line-items`,
    expect: statuses(200, 200, 200, 403),
  },
  {
    name: 'POST /api/jobs/:open/line-items',
    method: 'post',
    path: async (f) => `/api/jobs/${await openJob(f)}/line-items`,
    body: () => ({ kind: 'part', description: 'Spark plug', quantity: 2, unitPriceCents: 899 }),
    expect: statuses(201, 403, 403, 403),
  },
  {
    name: 'PATCH /api/jobs/:open/line-items/:itemId',
    method: 'patch',
    path: (f) => freshLine(f),
    body: () => ({ quantity: 0.75 }),
    expect: statuses(200, 403, 403, 403),
  },
  {
    name: 'DELETE /api/jobs/:open/line-items/:itemId',
    method: 'delete',
    path: (f) => freshLine(f),
    expect: statuses(204, 403, 403, 403),
  },
];
