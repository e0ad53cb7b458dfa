import type { Caller, TestApi } from '../../helpers/api';

export const CALLERS: readonly Caller[] = ['anonymous', 'customer', 'bookkeeper', 'helper', 'owner'];

/** Seeded records the rows point at: the demo customer's own, and another customer's. */
export interface Fixtures {
  api: TestApi;
  ownCustomerId: number;
  otherCustomerId: number;
  ownMachineId: number;
  otherMachineId: number;
  ownJobId: number;
  otherJobId: number;
  helperUserId: number;
}

/**
 * One route and the status each caller must get. `path` and `body` run once per caller (owner
 * last), so a row that deletes or changes something can make a fresh target each time.
 */
export interface AccessRow {
  name: string;
  method: 'get' | 'post' | 'patch' | 'put' | 'delete';
  path: (f: Fixtures, caller: Caller) => string | Promise<string>;
  body?: (f: Fixtures, caller: Caller) => unknown;
  expect: Record<Caller, number>;
}

/** Shorthand: the same status for the four signed-in roles, 401 for the signed-out caller. */
export function statuses(
  owner: number,
  helper: number,
  bookkeeper: number,
  customer: number,
): Record<Caller, number> {
  return { anonymous: 401, owner, helper, bookkeeper, customer };
}
