import request from 'supertest';
import { as } from '../../helpers/api';
import { statuses, type AccessRow, type Fixtures } from './types';

/** A customer made by the owner for a row that changes or archives one. */
async function freshCustomer(f: Fixtures): Promise<number> {
  const response = await request(f.api.app)
    .post('/api/customers')
    .set(as(f.api, 'owner'))
    .send({ name: 'Matrix Row Customer' })
    .expect(201);
  return response.body.id as number;
}

export const coreRows: AccessRow[] = [
  {
    name: 'GET /api/auth/me',
    method: 'get',
    path: () => '/api/auth/me',
    expect: statuses(200, 200, 200, 200),
  },
  {
    // A wrong current password: every signed-in role may try, and gets the 400 (changing nothing).
    name: 'POST /api/auth/password',
    method: 'post',
    path: () => '/api/auth/password',
    body: () => ({ currentPassword: 'not-the-password', newPassword: 'a-long-enough-password' }),
    expect: statuses(400, 400, 400, 400),
  },
  {
    name: 'GET /api/customers',
    method: 'get',
    path: () => '/api/customers',
    expect: statuses(200, 200, 200, 200),
  },
  {
    name: 'GET /api/customers/:own',
    method: 'get',
    path: (f) => `/api/customers/${f.ownCustomerId}`,
    expect: statuses(200, 200, 200, 200),
  },
  {
    name: "GET /api/customers/:other customer's",
    method: 'get',
    path: (f) => `/api/customers/${f.otherCustomerId}`,
    expect: statuses(200, 200, 200, 404),
  },
  {
    name: 'POST /api/customers',
    method: 'post',
    path: () => '/api/customers',
    body: () => ({ name: 'Sable Ferrin', town: 'Cinder Valley' }),
    expect: statuses(201, 201, 403, 403),
  },
  {
    name: 'PATCH /api/customers/:id',
    method: 'patch',
    path: async (f) => `/api/customers/${await freshCustomer(f)}`,
    body: () => ({ phone: '555-0199' }),
    expect: statuses(200, 200, 403, 403),
  },
  {
    name: 'DELETE /api/customers/:id (archive)',
    method: 'delete',
    path: async (f) => `/api/customers/${await freshCustomer(f)}`,
    expect: statuses(204, 403, 403, 403),
  },
  {
    name: 'GET /api/users',
    method: 'get',
    path: () => '/api/users',
    expect: statuses(200, 403, 403, 403),
  },
  {
    name: 'POST /api/users',
    method: 'post',
    path: () => '/api/users',
    body: (_f, caller) => ({
      email: `matrix-${caller}@ridgeback.test`,
      name: 'Matrix Helper',
      role: 'helper',
      password: 'a-long-enough-password',
    }),
    expect: statuses(201, 403, 403, 403),
  },
  {
    name: 'PATCH /api/users/:id',
    method: 'patch',
    path: (f) => `/api/users/${f.helperUserId}`,
    body: () => ({ name: 'Dana Whitlock' }),
    expect: statuses(200, 403, 403, 403),
  },
];
