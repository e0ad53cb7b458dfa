import { statuses, type AccessRow } from './types';

// The business's rates and terms: the staff read them (line items and invoices are priced with
// them), a customer does not, and only the owner changes them.
export const businessRows: AccessRow[] = [
  {
    name: 'GET /api/business',
    method: 'get',
    path: () => '/api/business',
    expect: statuses(200, 200, 200, 403),
  },
  {
    // The owner's change writes the value the seed already has, so no other row sees a new rate.
    name: 'PATCH /api/business',
    method: 'patch',
    path: () => '/api/business',
    body: () => ({ labourRateCents: 9_500 }),
    expect: statuses(200, 403, 403, 403),
  },
];
