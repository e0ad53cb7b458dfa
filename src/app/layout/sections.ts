import { isAllowed, type Action, type Resource } from '../../../shared/api/policy';
import type { Role } from '../../../shared/api/users';
import { paths } from '../paths';

export type Section = {
  path: string;
  label: string;
  /** A customer sees only their own records, so their sections are named as theirs. */
  customerLabel?: string;
  /** Who may open it: the roles shared/api/policy.ts lets use the resource the section is for. */
  roles: readonly Role[];
  /** Other paths whose pages belong to it (a machine's page is under customers and machines). */
  alsoAt?: readonly string[];
};

/**
 * The dashboard's sections in navigation order. The server decides who may do what; this list only
 * keeps a role from being offered a section the server would refuse. Each `roles` comes from the
 * policy table itself, narrowed where the section is for a job the role does not do (PRODUCT.md,
 * "Who uses it"): the bookkeeper may read jobs and reminders, but keeps the books, not the workshop.
 */
const ALL_ROLES = ['owner', 'helper', 'bookkeeper', 'customer'] as const satisfies readonly Role[];

/** The roles the policy lets `action` the `resource`, less any the section is not for. */
function rolesFor(resource: Resource, action: Action, except: readonly Role[] = []): Role[] {
  return ALL_ROLES.filter((role) => isAllowed(role, resource, action) && !except.includes(role));
}

export const sections: readonly Section[] = [
  { path: paths.week, label: 'Week', roles: rolesFor('reports', 'read') },
  {
    path: paths.jobs,
    label: 'Jobs',
    customerLabel: 'Your jobs',
    roles: rolesFor('jobs', 'list', ['bookkeeper']),
  },
  // A customer is shown only their own record and machines.
  {
    path: paths.customers,
    label: 'Customers & machines',
    customerLabel: 'Your machines',
    roles: rolesFor('machines', 'list'),
    alsoAt: ['/machines'],
  },
  {
    path: paths.invoices,
    label: 'Invoices',
    customerLabel: 'Your invoices',
    roles: rolesFor('invoices', 'list'),
  },
  { path: paths.mileage, label: 'Mileage', roles: rolesFor('trips', 'list') },
  { path: paths.reminders, label: 'Reminders', roles: rolesFor('reminders', 'list', ['bookkeeper']) },
  // The business's rates and its users: the owner's alone.
  { path: paths.settings, label: 'Settings', roles: rolesFor('users', 'list') },
];

export function sectionsFor(role: Role): Section[] {
  return sections.filter((section) => section.roles.includes(role));
}

export function sectionLabel(section: Section, role: Role): string {
  return role === 'customer' ? (section.customerLabel ?? section.label) : section.label;
}

/** The section a path belongs to (its own page or one below it), if any. */
export function sectionAt(pathname: string): Section | undefined {
  const under = (base: string) => pathname === base || pathname.startsWith(`${base}/`);
  return sections.find((section) => under(section.path) || (section.alsoAt ?? []).some(under));
}

/** Whether `role` is offered the section at `path`, so a page links only to sections the reader can open. */
export function mayOpen(path: string, role: Role): boolean {
  return sectionAt(path)?.roles.includes(role) ?? false;
}

/** Where a role lands after sign-in: its first section, so a helper starts on Jobs, not a refusal. */
export function homePathFor(role: Role): string {
  const first = sectionsFor(role)[0];
  if (!first) throw new Error(`no section is open to the ${role} role`);
  return first.path;
}

/** The label of the section at `path` for `role`. @throws Error for a path that is no section. */
export function labelOf(path: string, role: Role): string {
  const section = sectionAt(path);
  if (!section) throw new Error(`no section at ${path}`);
  return sectionLabel(section, role);
}
