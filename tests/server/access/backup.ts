import { statuses, type AccessRow } from './types';

export const backupRows: AccessRow[] = [
  {
    name: 'GET /api/backup',
    method: 'get',
    path: () => '/api/backup',
    expect: statuses(200, 403, 403, 403),
  },
  {
    // The owner passes the gate and meets the format check (400, nothing changed): a real restore
    // here would replace the data every other row relies on; tests/server/backup.test.ts does that.
    name: 'POST /api/backup/restore',
    method: 'post',
    path: () => '/api/backup/restore',
    body: () => ({ format: 'shop-export', version: 1 }),
    expect: statuses(400, 403, 403, 403),
  },
];
