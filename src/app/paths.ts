/** Every client route's path, so the router and the links never drift apart. */
export const paths = {
  week: '/',
  jobs: '/jobs',
  customers: '/customers',
  invoices: '/invoices',
  mileage: '/mileage',
  reminders: '/reminders',
  settings: '/settings',
} as const;
