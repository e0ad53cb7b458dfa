import type { Role } from '../../../../shared/api/users';

/** The role as the header and the refusal pages name it. */
export const roleLabels: Record<Role, string> = {
  owner: 'Owner',
  helper: 'Helper',
  bookkeeper: 'Bookkeeper',
  customer: 'Customer',
};
