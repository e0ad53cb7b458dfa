/**
 * Who may do what: the one table every route consults (PRODUCT.md, "Who uses it"). The server
 * decides; the dashboard only hides what this table would refuse. Which rows a customer sees is
 * narrowed again in the services, by the customer record their sign-in is tied to.
 */
import type { Role } from './users';

export type Action = 'list' | 'read' | 'create' | 'update' | 'delete';

const OWNER = ['owner'] as const;
const WORKSHOP = ['owner', 'helper'] as const;
const BOOKS = ['owner', 'bookkeeper'] as const;
const STAFF = ['owner', 'helper', 'bookkeeper'] as const;
const EVERYONE = ['owner', 'helper', 'bookkeeper', 'customer'] as const;
const WORKSHOP_AND_CUSTOMER = ['owner', 'helper', 'customer'] as const;
const BOOKS_AND_CUSTOMER = ['owner', 'bookkeeper', 'customer'] as const;

export const POLICY = {
  // The helper books customers and machines at the roadside; the bookkeeper reads them for the books.
  customers: { list: EVERYONE, read: EVERYONE, create: WORKSHOP, update: WORKSHOP, delete: OWNER },
  machines: { list: EVERYONE, read: EVERYONE, create: WORKSHOP, update: WORKSHOP, delete: OWNER },
  jobs: { list: EVERYONE, read: EVERYONE, create: WORKSHOP, update: WORKSHOP, delete: OWNER },
  // Measurements and checks are workshop work; a customer reads those of their own machines.
  readings: { list: WORKSHOP_AND_CUSTOMER, create: WORKSHOP, delete: OWNER },
  checks: { list: WORKSHOP_AND_CUSTOMER, read: WORKSHOP_AND_CUSTOMER, create: WORKSHOP, update: WORKSHOP },
  attachments: { list: WORKSHOP_AND_CUSTOMER, read: WORKSHOP_AND_CUSTOMER, create: WORKSHOP, delete: OWNER },
  // Prices are the owner's to set; the helper sees what was fitted, the bookkeeper what was billed.
  lineItems: { list: STAFF, create: OWNER, update: OWNER, delete: OWNER },
  invoices: { list: BOOKS_AND_CUSTOMER, read: BOOKS_AND_CUSTOMER, create: OWNER, update: OWNER },
  payments: { list: BOOKS_AND_CUSTOMER, create: OWNER },
  trips: { list: STAFF, read: STAFF, create: WORKSHOP, update: WORKSHOP, delete: OWNER },
  serviceIntervals: { list: STAFF, create: WORKSHOP, update: WORKSHOP, delete: OWNER },
  reminders: { list: STAFF, create: OWNER, update: OWNER },
  reports: { read: BOOKS },
  outbox: { list: OWNER },
  users: { list: OWNER, create: OWNER, update: OWNER },
  backup: { read: OWNER, create: OWNER },
  // The staff read the rates and tax that line items and invoices are priced with (the helper's
  // job page totals its lines with them); only the owner changes them, and the settings page is theirs.
  business: { read: STAFF, update: OWNER },
} as const satisfies Record<string, Partial<Record<Action, readonly Role[]>>>;

export type Resource = keyof typeof POLICY;

export function isAllowed(role: Role, resource: Resource, action: Action): boolean {
  const roles = (POLICY[resource] as Partial<Record<Action, readonly Role[]>>)[action];
  return roles !== undefined && roles.includes(role);
}
