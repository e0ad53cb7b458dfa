import request from 'supertest';
import { as } from '../../helpers/api';
import { statuses, type AccessRow, type Fixtures } from './types';

/** A machine of the other customer's, made by the owner, for a row that changes or archives one. */
async function freshMachine(f: Fixtures): Promise<number> {
  const response = await request(f.api.app)
    .post('/api/machines')
    .set(as(f.api, 'owner'))
    .send({
      customerId: f.otherCustomerId,
      kind: 'atv',
      make: 'Tamarack',
      model: 'Matrix Row 450',
      meterUnit: 'h',
    })
    .expect(201);
  return response.body.id as number;
}

/** A booked job on the other customer's seeded machine, for a row that changes or deletes one. */
async function freshJob(f: Fixtures): Promise<number> {
  const response = await request(f.api.app)
    .post('/api/jobs')
    .set(as(f.api, 'owner'))
    .send({ customerId: f.otherCustomerId, machineId: f.otherMachineId, complaint: 'Matrix row booking.' })
    .expect(201);
  return response.body.id as number;
}

export const workshopRows: AccessRow[] = [
  {
    name: 'GET /api/machines',
    method: 'get',
    path: () => '/api/machines',
    expect: statuses(200, 200, 200, 200),
  },
  {
    name: 'GET /api/machines/:own',
    method: 'get',
    path: (f) => `/api/machines/${f.ownMachineId}`,
    expect: statuses(200, 200, 200, 200),
  },
  {
    name: "GET /api/machines/:other customer's",
    method: 'get',
    path: (f) => `/api/machines/${f.otherMachineId}`,
    expect: statuses(200, 200, 200, 404),
  },
  {
    name: 'GET /api/machines/:own/history',
    method: 'get',
    path: (f) => `/api/machines/${f.ownMachineId}/history`,
    expect: statuses(200, 200, 200, 200),
  },
  {
    name: "GET /api/machines/:other/history (another customer's)",
    method: 'get',
    path: (f) => `/api/machines/${f.otherMachineId}/history`,
    expect: statuses(200, 200, 200, 404),
  },
  {
    name: 'POST /api/machines',
    method: 'post',
    path: () => '/api/machines',
    body: (f) => ({
      customerId: f.ownCustomerId,
      kind: 'motorcycle',
      make: 'Kestrel',
      model: 'Quillback 300',
      meterUnit: 'mi',
    }),
    expect: statuses(201, 201, 403, 403),
  },
  {
    name: 'PATCH /api/machines/:id',
    method: 'patch',
    path: async (f) => `/api/machines/${await freshMachine(f)}`,
    body: () => ({ fuelPressureMinKpa: '40psi' }),
    expect: statuses(200, 200, 403, 403),
  },
  {
    name: 'DELETE /api/machines/:id (archive)',
    method: 'delete',
    path: async (f) => `/api/machines/${await freshMachine(f)}`,
    expect: statuses(204, 403, 403, 403),
  },
  {
    name: 'GET /api/jobs',
    method: 'get',
    path: () => '/api/jobs',
    expect: statuses(200, 200, 200, 200),
  },
  {
    name: 'GET /api/jobs/:own',
    method: 'get',
    path: (f) => `/api/jobs/${f.ownJobId}`,
    expect: statuses(200, 200, 200, 200),
  },
  {
    name: "GET /api/jobs/:other customer's",
    method: 'get',
    path: (f) => `/api/jobs/${f.otherJobId}`,
    expect: statuses(200, 200, 200, 404),
  },
  {
    name: 'POST /api/jobs',
    method: 'post',
    path: () => '/api/jobs',
    body: (f) => ({
      customerId: f.ownCustomerId,
      machineId: f.ownMachineId,
      complaint: 'Hard starting when cold.',
    }),
    expect: statuses(201, 201, 403, 403),
  },
  {
    name: 'PATCH /api/jobs/:id',
    method: 'patch',
    path: async (f) => `/api/jobs/${await freshJob(f)}`,
    body: () => ({ location: 'Flume Road pull-out, Ashgrove Flats' }),
    expect: statuses(200, 200, 403, 403),
  },
  {
    name: 'POST /api/jobs/:id/status',
    method: 'post',
    path: async (f) => `/api/jobs/${await freshJob(f)}/status`,
    body: () => ({ status: 'on_site' }),
    expect: statuses(200, 200, 403, 403),
  },
  {
    name: 'POST /api/jobs/:id/notes',
    method: 'post',
    path: async (f) => `/api/jobs/${await freshJob(f)}/notes`,
    body: () => ({ note: 'Gate code left with the neighbour.' }),
    expect: statuses(201, 201, 403, 403),
  },
  {
    name: 'DELETE /api/jobs/:id (a booking made by mistake)',
    method: 'delete',
    path: async (f) => `/api/jobs/${await freshJob(f)}`,
    expect: statuses(204, 403, 403, 403),
  },
];
