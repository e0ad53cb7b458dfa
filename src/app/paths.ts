/** Every client route's path, so the router and the links never drift apart. */
export const paths = {
  /** Sends each person on to their role's first section (sections.ts, homePathFor). */
  home: '/',
  signIn: '/sign-in',
  week: '/week',
  jobs: '/jobs',
  customers: '/customers',
  invoices: '/invoices',
  mileage: '/mileage',
  reminders: '/reminders',
  settings: '/settings',
} as const;
